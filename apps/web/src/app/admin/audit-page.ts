import { DatePipe, JsonPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, type Signal, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
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
import { catchError, debounceTime, distinctUntilChanged, map, of, startWith, Subject, switchMap } from 'rxjs';
import { readProblem } from '../problem/read-problem';
import { AuditApi, type AuditPageRequest } from './audit-api';

interface AuditView {
  loading: boolean;
  entries: AuditEntry[];
  total: number;
  problem: string | null;
}

// Typing in the action filter waits this long before asking the server (a common UI pause, our choice).
const filterPauseMs = 300;

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
  private readonly typedAction = new Subject<string>();

  protected readonly columns = ['at', 'actor', 'action', 'target', 'details'];
  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(50);
  protected readonly action = signal('');
  private readonly reloads = signal(0);

  private readonly request = computed<AuditPageRequest & { reload: number }>(() => ({
    limit: this.pageSize(),
    offset: this.pageIndex() * this.pageSize(),
    action: this.action().trim() || undefined,
    reload: this.reloads(),
  }));

  private readonly view: Signal<AuditView> = toSignal(
    toObservable(this.request).pipe(
      switchMap(({ reload: _reload, ...req }) =>
        this.api.page(req).pipe(
          map((r): AuditView => ({ loading: false, entries: r.entries, total: r.total, problem: null })),
          catchError((err: unknown) =>
            of<AuditView>({ loading: false, entries: [], total: 0, problem: readProblem(err).message }),
          ),
          startWith<AuditView>({
            loading: true,
            entries: this.entries(),
            total: this.total(),
            problem: null,
          }),
        ),
      ),
    ),
    { initialValue: { loading: true, entries: [], total: 0, problem: null } satisfies AuditView },
  );
  protected readonly entries: Signal<AuditEntry[]> = computed(() => this.view().entries);
  protected readonly total: Signal<number> = computed(() => this.view().total);
  protected readonly loading = computed(() => this.view().loading);
  protected readonly problem = computed(() => this.view().problem);

  constructor() {
    this.typedAction
      .pipe(debounceTime(filterPauseMs), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((value) => {
        this.pageIndex.set(0);
        this.action.set(value);
      });
  }

  protected onActionInput(value: string): void {
    this.typedAction.next(value);
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected reload(): void {
    this.reloads.update((n) => n + 1);
  }

  protected hasDetails(entry: AuditEntry): boolean {
    return entry.details !== null && Object.keys(entry.details).length > 0;
  }
}
