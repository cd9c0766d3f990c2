import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator } from '@angular/material/paginator';
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
import { MatTooltip } from '@angular/material/tooltip';
import type { Role, UserRecord } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { bindTable } from '../lists/bind-table';
import { serverList } from '../lists/server-list';
import { readProblem } from '../problem/read-problem';
import { roleChoices, roleLabel } from '../shell/role-label';
import { ConfirmDialog, type ConfirmDialogData } from './confirm-dialog';
import { CreateUserDialog } from './create-user-dialog';
import { UsersApi } from './users-api';

/** Admin: every user, with search, sorting and paging; create users, change roles, disable and enable. */
@Component({
  selector: 'cb-users-page',
  imports: [
    DatePipe,
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
    MatPaginator,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatInput,
    MatSelect,
    MatOption,
    MatButton,
    MatIcon,
    MatProgressBar,
    MatTooltip,
  ],
  templateUrl: './users-page.html',
  styleUrl: './users-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UsersPage {
  private readonly api = inject(UsersApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);

  protected readonly roles = roleChoices;
  protected readonly roleLabel = roleLabel;
  protected readonly columns = ['name', 'role', 'disabled', 'lastSignInAt', 'createdAt', 'actions'];
  protected readonly dataSource = new MatTableDataSource<UserRecord>([]);
  private readonly list = serverList({ load: () => this.api.list(), empty: [] as UserRecord[] });
  protected readonly loading = this.list.loading;
  protected readonly problem = this.list.problem;
  protected readonly filter = signal('');
  /** Rows with a change on its way to the server. */
  protected readonly pending = signal<ReadonlySet<number>>(new Set());
  protected readonly myId = computed(() => this.session.user()?.id ?? null);

  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  constructor() {
    this.dataSource.filterPredicate = (u, term) =>
      `${u.name}\n${u.email}\n${u.role}\n${roleLabel(u.role)}`.toLowerCase().includes(term);
    bindTable(this.dataSource, { rows: this.list.value, sort: this.sort, paginator: this.paginator });
  }

  protected applyFilter(value: string): void {
    this.filter.set(value);
    this.dataSource.filter = value.trim().toLowerCase();
    this.dataSource.paginator?.firstPage();
  }

  protected openCreate(): void {
    this.dialog
      .open<CreateUserDialog, void, UserRecord>(CreateUserDialog, {
        autoFocus: 'first-tabbable',
        width: '480px',
      })
      .afterClosed()
      .subscribe((user) => {
        if (!user) return;
        this.replace(user);
        this.snackBar.open(`${user.name} was added as ${roleLabel(user.role).toLowerCase()}.`, undefined, {
          duration: 4000,
        });
      });
  }

  protected changeRole(user: UserRecord, role: Role): void {
    if (role === user.role) return;
    this.save(user, { role }, `${user.name} is now ${roleLabel(role).toLowerCase()}.`);
  }

  protected toggleDisabled(user: UserRecord): void {
    const disabling = !user.disabled;
    const data: ConfirmDialogData = disabling
      ? {
          title: `Disable ${user.name}?`,
          message: `${user.email} will be signed out and can no longer sign in until enabled again. Orders and history stay.`,
          confirmLabel: 'Disable',
          destructive: true,
        }
      : {
          title: `Enable ${user.name}?`,
          message: `${user.email} will be able to sign in again with their password.`,
          confirmLabel: 'Enable',
        };
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '420px' })
      .afterClosed()
      .subscribe((ok) => {
        if (ok)
          this.save(user, { disabled: disabling }, `${user.name} is ${disabling ? 'disabled' : 'enabled'}.`);
      });
  }

  protected isPending(id: number): boolean {
    return this.pending().has(id);
  }

  private save(user: UserRecord, change: { role?: Role; disabled?: boolean }, done: string): void {
    this.setPending(user.id, true);
    this.api.update(user.id, change).subscribe({
      next: (updated) => {
        this.setPending(user.id, false);
        this.replace(updated);
        this.snackBar.open(done, undefined, { duration: 4000 });
      },
      error: (err: unknown) => {
        this.setPending(user.id, false);
        // Redraw the row as it was, so the select does not show a role the server refused.
        this.dataSource.data = [...this.dataSource.data];
        this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
      },
    });
  }

  private replace(user: UserRecord): void {
    const rows = this.dataSource.data;
    const i = rows.findIndex((u) => u.id === user.id);
    this.dataSource.data = i < 0 ? [...rows, user] : rows.map((u) => (u.id === user.id ? user : u));
  }

  private setPending(id: number, on: boolean): void {
    const next = new Set(this.pending());
    if (on) next.add(id);
    else next.delete(id);
    this.pending.set(next);
  }
}
