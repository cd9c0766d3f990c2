import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSort, MatSortHeader } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatNoDataRow,
  MatRow,
  MatRowDef,
  MatTable,
  MatTableDataSource,
} from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { FilmProcess, Stock } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { afterTypingPause } from '../lists/after-typing-pause';
import { bindTable } from '../lists/bind-table';
import { serverList } from '../lists/server-list';
import { CatalogueApi, type StockFilters } from './catalogue-api';
import { NewStockDialog } from './new-stock-dialog';
import { maskingLabel, processChoices, processLabel } from './stock-labels';

/** Every signed-in user: the stock catalogue, searched and filtered by the server, sorted in the table. */
@Component({
  selector: 'cb-catalogue-page',
  imports: [
    RouterLink,
    MatTable,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatCell,
    MatCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatRow,
    MatRowDef,
    MatNoDataRow,
    MatSort,
    MatSortHeader,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatInput,
    MatSelect,
    MatOption,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatButton,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './catalogue-page.html',
  styleUrl: './catalogue-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CataloguePage {
  private readonly api = inject(CatalogueApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);

  protected readonly processes = processChoices;
  protected readonly processLabel = processLabel;
  protected readonly maskingLabel = maskingLabel;
  protected readonly columns = ['name', 'maker', 'iso', 'process', 'masked', 'baseMaterial'];
  protected readonly dataSource = new MatTableDataSource<Stock>([]);
  protected readonly canAddStocks = computed(() => {
    const role = this.session.role();
    return role === 'manager' || role === 'admin';
  });

  /** What the search box shows, as typed. */
  protected readonly searchText = signal('');
  /** The search the server was asked for, a pause after typing. */
  protected readonly search = signal('');
  protected readonly process = signal<FilmProcess | ''>('');
  protected readonly masking = signal<StockFilters['masking']>('');
  protected readonly filtered = computed(
    () => this.search().trim() !== '' || !!this.process() || !!this.masking(),
  );

  private readonly filters = computed((): StockFilters => ({
    q: this.search(),
    process: this.process(),
    masking: this.masking(),
  }));
  private readonly list = serverList({
    request: this.filters,
    load: (filters: StockFilters) => this.api.stocks(filters),
    empty: [] as Stock[],
  });
  protected readonly loading = this.list.loading;
  protected readonly problem = this.list.problem;
  /** Sends the search to the server a pause after typing. */
  private readonly typedSearch = afterTypingPause((value) => this.search.set(value));
  private readonly sort = viewChild.required(MatSort);

  constructor() {
    this.dataSource.sortingDataAccessor = (stock, column) => {
      if (column === 'process') return processLabel(stock.process);
      if (column === 'masked') return maskingLabel(stock);
      const value = stock[column as keyof Stock];
      return typeof value === 'number' ? value : String(value).toLowerCase();
    };
    bindTable(this.dataSource, { rows: this.list.value, sort: this.sort });
  }

  protected onSearchInput(value: string): void {
    this.searchText.set(value);
    this.typedSearch(value);
  }

  protected clearFilters(): void {
    this.searchText.set('');
    this.typedSearch('');
    this.search.set('');
    this.process.set('');
    this.masking.set('');
  }

  protected openNewStock(): void {
    this.dialog
      .open<NewStockDialog, void, Stock>(NewStockDialog, { autoFocus: 'first-tabbable', width: '640px' })
      .afterClosed()
      .subscribe((stock) => {
        if (!stock) return;
        this.list.reload();
        this.snackBar.open(`${stock.name} was added to the catalogue.`, undefined, { duration: 4000 });
      });
  }
}
