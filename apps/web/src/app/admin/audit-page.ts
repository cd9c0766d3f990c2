import { DatePipe, JsonPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, type Signal, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator, type PageEvent } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
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
} from '@angular/material/table';
import type { AuditEntry } from '@clearbase/contracts';
import { afterTypingPause } from '../lists/after-typing-pause';
import { serverList } from '../lists/server-list';
import { AuditApi, type AuditPageRequest } from './audit-api';

/** Admin: the audit log, newest first, paged by the server, with a filter on the action. */
@Component({
  selector: 'cb-audit-page',
  imports: [
    DatePipe,
    JsonPipe,
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
    MatPaginator,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatInput,
    MatIcon,
    MatButton,
    MatProgressBar,
  ],
  templateUrl: './audit-page.html',
  styleUrl: './audit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditPage {
  private readonly api = inject(AuditApi);

  protected readonly columns = ['at', 'actor', 'action', 'target', 'details'];
  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(50);
  protected readonly action = signal('');

  private readonly request = computed<AuditPageRequest>(() => ({
    limit: this.pageSize(),
    offset: this.pageIndex() * this.pageSize(),
    action: this.action().trim() || undefined,
  }));
  private readonly list = serverList({
    request: this.request,
    load: (request: AuditPageRequest) => this.api.page(request),
    empty: { entries: [] as AuditEntry[], total: 0 },
  });
  protected readonly entries: Signal<AuditEntry[]> = computed(() => this.list.value().entries);
  protected readonly total: Signal<number> = computed(() => this.list.value().total);
  protected readonly loading = this.list.loading;
  protected readonly problem = this.list.problem;
  /** Filters on the action a pause after typing, from the first page. */
  protected readonly onActionInput = afterTypingPause((value) => {
    this.pageIndex.set(0);
    this.action.set(value);
  });

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected reload(): void {
    this.list.reload();
  }

  protected hasDetails(entry: AuditEntry): boolean {
    return entry.details !== null && Object.keys(entry.details).length > 0;
  }
}
