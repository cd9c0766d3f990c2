import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
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
import type { Scanner } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { serverList } from '../lists/server-list';
import { ScannerDialog } from './scanner-dialog';
import { encodingLabel, kindLabel } from './scanner-labels';
import { ScannersApi } from './scanners-api';

/** Three channel values as the table prints them. */
function triple(values: readonly number[]): string {
  return values.map((v) => String(v)).join(' · ');
}

/** Staff: the lab's scanners and their input profiles; managers add and change them. */
@Component({
  selector: 'cb-scanners-page',
  imports: [
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
    MatButton,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './scanners-page.html',
  styleUrl: './scanners-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ScannersPage {
  private readonly api = inject(ScannersApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);

  protected readonly kindLabel = kindLabel;
  protected readonly encodingLabel = encodingLabel;
  protected readonly triple = triple;
  protected readonly canEdit = computed(() => {
    const role = this.session.role();
    return role === 'manager' || role === 'admin';
  });
  protected readonly columns = computed(() => [
    'name',
    'kind',
    'encoding',
    'blackLevel',
    'gains',
    ...(this.canEdit() ? ['actions'] : []),
  ]);
  private readonly list = serverList({ load: () => this.api.list(), empty: [] as Scanner[] });
  protected readonly scanners = this.list.value;
  protected readonly loading = this.list.loading;
  protected readonly problem = this.list.problem;

  protected open(scanner: Scanner | null): void {
    this.dialog
      .open<ScannerDialog, Scanner | null, Scanner>(ScannerDialog, {
        data: scanner,
        autoFocus: 'first-tabbable',
        width: '600px',
      })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        this.list.reload();
        this.snackBar.open(`${saved.name} was ${scanner ? 'saved' : 'added'}.`, undefined, {
          duration: 4000,
        });
      });
  }
}
