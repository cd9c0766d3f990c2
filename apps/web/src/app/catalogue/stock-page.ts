import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  signal,
  type Signal,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatAnchor, MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { ImportProfileResponse, ProfileVersionSummary, Stock, StockDetail } from '@clearbase/contracts';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { ConfirmDialog, type ConfirmDialogData } from '../admin/confirm-dialog';
import { Session } from '../auth/session';
import { CalibrationApi } from '../calibration/calibration-api';
import { readProblem } from '../problem/read-problem';
import { CatalogueApi } from './catalogue-api';
import { ProfileImport } from './profile-import';
import { StockSheet } from './stock-sheet';
import { StockSheetDialog } from './stock-sheet-dialog';
import { VersionCompare } from './version-compare';
import { VersionTimeline, type ProfileWithVersions } from './version-timeline';
import { staffRoles } from '@clearbase/contracts/values';

interface StockView {
  loading: boolean;
  detail: StockDetail | null;
  problem: string | null;
}

/**
 * A stock: its sheet for everyone; for lab staff also its profiles, each with its versions as a timeline, a
 * comparison of two versions, and an import of profile documents.
 */
@Component({
  selector: 'cb-stock-page',
  imports: [
    RouterLink,
    MatAnchor,
    MatButton,
    MatIcon,
    MatProgressBar,
    StockSheet,
    VersionTimeline,
    VersionCompare,
    ProfileImport,
  ],
  templateUrl: './stock-page.html',
  styleUrl: './stock-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StockPage {
  private readonly api = inject(CatalogueApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);
  private readonly calibrationApi = inject(CalibrationApi);

  /** The stock's id, from the route. */
  readonly id = input.required<string>();

  protected readonly role = this.session.role;
  protected readonly isStaff = computed(() => (staffRoles as readonly string[]).includes(this.role() ?? ''));
  protected readonly isManager = computed(() => this.role() === 'manager' || this.role() === 'admin');
  protected readonly pending = signal<ReadonlySet<number>>(new Set());
  protected readonly exportUrl = (versionId: number) => this.api.exportUrl(versionId);
  private readonly reloads = signal(0);

  private readonly request = computed(() => ({ id: Number(this.id()), reload: this.reloads() }));
  private readonly view: Signal<StockView> = toSignal(
    toObservable(this.request).pipe(
      switchMap(({ id }) =>
        this.api.stock(id).pipe(
          map((detail): StockView => ({ loading: false, detail, problem: null })),
          catchError((err: unknown) =>
            of<StockView>({ loading: false, detail: null, problem: readProblem(err).message }),
          ),
          startWith<StockView>({ loading: true, detail: this.detail(), problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, detail: null, problem: null } satisfies StockView },
  );
  /** For staff: which versions of this stock were fitted from a calibration, version id to calibration id. */
  protected readonly calibrations = toSignal(
    toObservable(this.request).pipe(
      switchMap(({ id }) =>
        this.isStaff()
          ? this.calibrationApi.list(id).pipe(
              map(
                (list) =>
                  new Map(list.flatMap((c) => (c.profileVersionId ? [[c.profileVersionId, c.id]] : []))),
              ),
              catchError(() => of(new Map<number, number>())),
            )
          : of(new Map<number, number>()),
      ),
    ),
    { initialValue: new Map<number, number>() },
  );
  protected readonly detail = computed(() => this.view().detail);
  protected readonly loading = computed(() => this.view().loading);
  protected readonly problem = computed(() => this.view().problem);

  protected editSheet(stock: Stock): void {
    this.dialog
      .open<StockSheetDialog, Stock, Stock>(StockSheetDialog, {
        data: stock,
        autoFocus: 'first-tabbable',
        width: '640px',
      })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        this.reload();
        this.snackBar.open(`The sheet of ${saved.name} is saved.`, undefined, { duration: 4000 });
      });
  }

  protected newDraft(profile: ProfileWithVersions, from: ProfileVersionSummary): void {
    this.setPending(from.id, true);
    this.api.newDraft(profile.id, from.id).subscribe({
      next: (draft) => {
        this.setPending(from.id, false);
        this.reload();
        this.snackBar.open(`Version ${draft.version} of ${profile.name} is a new draft.`, undefined, {
          duration: 4000,
        });
      },
      error: (err: unknown) => this.failed(from.id, err),
    });
  }

  protected retire(profile: ProfileWithVersions, version: ProfileVersionSummary): void {
    const data: ConfirmDialogData = {
      title: `Retire version ${version.version}?`,
      message: `Version ${version.version} of ${profile.name} will no longer be offered for new rolls. Rolls rendered with it keep it and still render.`,
      confirmLabel: 'Retire',
      destructive: true,
    };
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '420px' })
      .afterClosed()
      .subscribe((ok) => {
        if (!ok) return;
        this.setPending(version.id, true);
        this.api.retire(version.id).subscribe({
          next: () => {
            this.setPending(version.id, false);
            this.reload();
            this.snackBar.open(`Version ${version.version} is retired.`, undefined, { duration: 4000 });
          },
          error: (err: unknown) => this.failed(version.id, err),
        });
      });
  }

  protected imported(made: ImportProfileResponse): void {
    this.reload();
    const what =
      made.created === 'profile'
        ? `a new profile, ${made.profile.name}`
        : `draft version ${made.version.version} of ${made.profile.name}`;
    this.snackBar.open(`The document was imported as ${what}.`, undefined, { duration: 6000 });
  }

  private reload(): void {
    this.reloads.update((n) => n + 1);
  }

  private failed(versionId: number, err: unknown): void {
    this.setPending(versionId, false);
    this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
  }

  private setPending(id: number, on: boolean): void {
    const next = new Set(this.pending());
    if (on) next.add(id);
    else next.delete(id);
    this.pending.set(next);
  }
}
