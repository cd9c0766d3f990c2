import { ChangeDetectionStrategy, Component, computed, inject, signal, type Signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
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
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import { ScannerDialog } from './scanner-dialog';
import { encodingLabel, kindLabel } from './scanner-labels';
import { ScannersApi } from './scanners-api';

interface ScannersView {
  loading: boolean;
  scanners: Scanner[];
  problem: string | null;
}

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
  private readonly reloads = signal(0);
  private readonly view: Signal<ScannersView> = toSignal(
    toObservable(this.reloads).pipe(
      switchMap(() =>
        this.api.list().pipe(
          map((scanners): ScannersView => ({ loading: false, scanners, problem: null })),
          catchError((err: unknown) =>
            of<ScannersView>({ loading: false, scanners: [], problem: readProblem(err).message }),
          ),
          startWith<ScannersView>({ loading: true, scanners: this.scanners(), problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, scanners: [], problem: null } satisfies ScannersView },
  );
  protected readonly scanners = computed(() => this.view().scanners);
  protected readonly loading = computed(() => this.view().loading);
  protected readonly problem = computed(() => this.view().problem);

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
        this.reloads.update((n) => n + 1);
        this.snackBar.open(`${saved.name} was ${scanner ? 'saved' : 'added'}.`, undefined, {
          duration: 4000,
        });
      });
  }
}
