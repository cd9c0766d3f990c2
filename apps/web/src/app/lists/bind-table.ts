import { effect, type Signal } from '@angular/core';
import type { MatPaginator } from '@angular/material/paginator';
import type { MatSort } from '@angular/material/sort';
import type { MatTableDataSource } from '@angular/material/table';

/**
 * Feeds a table's data source from `rows` and hands it the table's sort headers and paginator once the view has
 * them. Call it in an injection context; rows changed in place afterwards (`dataSource.data = …`) stay until
 * `rows` changes.
 *
 * @example
 * bindTable(this.dataSource, { rows: this.list.value, sort: this.sort }); // sort = viewChild.required(MatSort)
 */
export function bindTable<T>(
  dataSource: MatTableDataSource<T>,
  parts: { rows: Signal<T[]>; sort: Signal<MatSort>; paginator?: Signal<MatPaginator> },
): void {
  effect(() => {
    dataSource.sort = parts.sort();
    if (parts.paginator) dataSource.paginator = parts.paginator();
  });
  effect(() => {
    dataSource.data = parts.rows();
  });
}
