import { DestroyRef, Injectable, InjectionToken, computed, effect, inject, signal } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { Adjustments, Balance, ReviewDecision, RollTuning } from '@clearbase/contracts';
import { pickNeutral } from '@clearbase/inversion';
import {
  concat,
  EMPTY,
  expand,
  forkJoin,
  last,
  switchMap,
  take,
  timer,
  type Observable,
  type Subscription,
} from 'rxjs';
import { readProblem } from '../problem/read-problem';
import { PreviewRenderer } from '../preview/preview-renderer';
import { negativeRegion, withCorrection, type DraggedRectangle } from './neutral-pick';
import { TuningApi, type WorkingNegative } from './tuning-api';
import {
  adjustmentsOf,
  historyReducer,
  startHistory,
  type HistoryAction,
  type TuningState,
  type TuningTarget,
} from './tuning-history';
import { previewParams, previewProfile } from './tuning-preview';

/** Milliseconds between readings of the sheet while frames render again after a save; a test sets it short. */
export const RENDER_POLL_MS = new InjectionToken<number>('render poll interval', {
  providedIn: 'root',
  // every 2 s: soon enough to see a frame come back, light on the server: our choice
  factory: () => 2000,
});
// at most 90 readings, about 3 minutes at 2 s, a long roll's render: our choice
const RENDER_POLL_LIMIT = 90;

/** No tuning at all: what a reset goes back to, and what the "before" preview renders with. */
export const noTuning: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/**
 * The tuning of one roll while its screen is open: the sheet read from the server, the selected frame and its
 * working negative (rendered live by the page's preview worker), the edits with their undo and redo history, the
 * frames picked for a copy, saving, and the frame reviews. Provided by the tuning page, shared by its parts.
 */
@Injectable()
export class TuningSession {
  private readonly api = inject(TuningApi);
  private readonly snack = inject(MatSnackBar);
  private readonly pollMs = inject(RENDER_POLL_MS);
  private readonly preview = inject(PreviewRenderer);

  private readonly sheetState = signal<RollTuning | null>(null);
  private readonly problemState = signal<string | null>(null);
  private readonly frameIdState = signal<number | null>(null);
  private readonly negativeState = signal<WorkingNegative | null>(null);
  private readonly loadingNegativeState = signal(false);
  private readonly history = signal(startHistory({ roll: noTuning, frames: {} }));
  private readonly saved = signal<TuningState>({ roll: noTuning, frames: {} });
  private readonly selectedState = signal<ReadonlySet<number>>(new Set());
  private readonly savingState = signal(false);
  private readonly saveProblemState = signal<string | null>(null);
  private readonly lastPickState = signal<Balance | null>(null);

  /** The roll, its profile and its frames, as last read. */
  readonly sheet = this.sheetState.asReadonly();
  /** What went wrong loading or reviewing, in the server's words. */
  readonly problem = this.problemState.asReadonly();
  readonly frameId = this.frameIdState.asReadonly();
  /** The selected frame's working negative, once it is in. */
  readonly negative = this.negativeState.asReadonly();
  readonly loadingNegative = this.loadingNegativeState.asReadonly();
  /** The frames picked in the strip for a copy. */
  readonly selected = this.selectedState.asReadonly();
  readonly saving = this.savingState.asReadonly();
  readonly saveProblem = this.saveProblemState.asReadonly();
  /** The whole printer points the neutral picker last found. */
  readonly lastPick = this.lastPickState.asReadonly();
  /** Whether the controls edit the selected frame or the whole roll. */
  readonly target = signal<'frame' | 'roll'>('frame');
  /** Whether saving renders with the roll's levels together rather than each frame's own. */
  readonly rollLevels = signal(false);
  /** The operator's note for the next review. */
  readonly note = signal('');

  readonly frames = computed(() => this.sheet()?.frames ?? []);
  readonly frame = computed(() => this.frames().find((f) => f.id === this.frameId()) ?? null);
  readonly state = computed(() => this.history().present);
  readonly editTarget = computed<TuningTarget | null>(() => {
    const id = this.frameId();
    return this.target() === 'roll' ? { kind: 'roll' } : id === null ? null : { kind: 'frame', frameId: id };
  });
  /** The adjustments the controls show and edit. */
  readonly editing = computed<Adjustments>(() => {
    const t = this.editTarget();
    return (t && adjustmentsOf(this.state(), t)) ?? noTuning;
  });
  /** The selected frame's own adjustments. */
  readonly frameAdjustments = computed(() => {
    const id = this.frameId();
    return (id !== null && this.state().frames[id]) || noTuning;
  });
  readonly unsaved = computed(() => !same(this.state(), this.saved()));
  readonly canUndo = computed(() => this.history().past.length > 0);
  readonly canRedo = computed(() => this.history().future.length > 0);

  private sheetLoad: Subscription | null = null;
  private negativeLoad: Subscription | null = null;
  private renderPoll: Subscription | null = null;

  constructor() {
    // every change of the adjustments or the frame asks the worker for a new "after"
    effect(() => {
      const sheet = this.sheet();
      const n = this.negative();
      const ready = this.preview.ready();
      if (!sheet || !n || !ready) return;
      this.preview.render(
        'after',
        previewProfile(sheet.profile, n.levels, this.state().roll, this.frameAdjustments()),
      );
    });
    inject(DestroyRef).onDestroy(() => {
      this.sheetLoad?.unsubscribe();
      this.negativeLoad?.unsubscribe();
      this.renderPoll?.unsubscribe();
    });
  }

  /** Reads the roll's sheet and starts from its saved tuning, on its first frame. */
  open(rollId: number): void {
    this.sheetLoad?.unsubscribe();
    this.sheetLoad = this.api.tuning(rollId).subscribe({
      next: (sheet) => this.takeSheet(sheet),
      error: (err: unknown) => this.problemState.set(readProblem(err).message),
    });
  }

  private takeSheet(sheet: RollTuning): void {
    this.sheetState.set(sheet);
    const state: TuningState = {
      roll: sheet.roll.adjustments,
      frames: Object.fromEntries(sheet.frames.map((f) => [f.id, f.adjustments])),
    };
    this.saved.set(state);
    this.history.set(startHistory(state));
    if (this.frameId() === null && sheet.frames[0]) this.selectFrame(sheet.frames[0].id);
  }

  /** Shows another frame: its working negative is fetched and handed to the preview worker. */
  selectFrame(id: number): void {
    const sheet = this.sheet();
    if (!sheet || id === this.frameId()) return;
    this.frameIdState.set(id);
    this.negativeState.set(null);
    this.loadingNegativeState.set(true);
    this.negativeLoad?.unsubscribe();
    this.negativeLoad = this.api.workingNegative(id, sheet.scanner).subscribe({
      next: (n) => {
        this.loadingNegativeState.set(false);
        // the worker takes the pixels; the session keeps its own copy for the picker and the histogram
        const copy = { ...n, pixels: n.pixels.slice() };
        this.negativeState.set(n);
        this.preview.load(copy, sheet.profile, n.levels);
        this.preview.render('before', previewProfile(sheet.profile, n.levels, noTuning, noTuning));
      },
      error: (err: unknown) => {
        this.loadingNegativeState.set(false);
        this.problemState.set(readProblem(err).message);
      },
    });
  }

  /** The previous (−1) or next (+1) frame of the roll, staying put at the ends. */
  step(delta: number): void {
    const list = this.frames();
    const at = list.findIndex((f) => f.id === this.frameId());
    const next = list[Math.min(list.length - 1, Math.max(0, at + delta))];
    if (next) this.selectFrame(next.id);
  }

  private dispatch(action: HistoryAction): void {
    this.history.update((h) => historyReducer(h, action));
  }

  /** One step of the history: what the controls edit, with `patch` applied. */
  change(patch: Partial<Adjustments>): void {
    const t = this.editTarget();
    if (t) this.dispatch({ type: 'set', target: t, adjustments: { ...this.editing(), ...patch } });
  }

  /** Moves one cast axis, in whole printer points. */
  changeCast(axis: keyof Balance, points: number): void {
    this.change({ balance: { ...this.editing().balance, [axis]: Math.round(points) } });
  }

  /** Moves the exposure, in sixths of a stop. */
  changeExposure(sixths: number): void {
    this.change({ exposureStops: Math.round(sixths) / 6 });
  }

  /** Moves the black or the white point, in sixths of a stop. */
  changePoint(point: 'blackPointStops' | 'whitePointStops', sixths: number): void {
    this.change({ [point]: Math.round(sixths) / 6 });
  }

  /** Sets the contrast, to two decimals; null goes back to the profile's. */
  changeContrast(value: number | null): void {
    this.change({ contrast: value === null ? null : Math.round(value * 100) / 100 });
  }

  undo(): void {
    this.dispatch({ type: 'undo' });
  }

  redo(): void {
    this.dispatch({ type: 'redo' });
  }

  /** Back to no tuning for what the controls edit, as one step that undo takes back. */
  reset(): void {
    const t = this.editTarget();
    if (t) this.dispatch({ type: 'set', target: t, adjustments: noTuning });
  }

  toggleSelected(id: number): void {
    this.selectedState.update((s) => {
      const next = new Set(s);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  }

  /** The selected frame's adjustments onto every other picked frame, in one step. */
  copyToSelected(): void {
    const ids = [...this.selected()].filter((id) => id !== this.frameId());
    this.dispatch({ type: 'copy', from: this.frameAdjustments(), frameIds: ids });
    this.snack.open(`Copied to ${ids.length} frame${ids.length === 1 ? '' : 's'}`, undefined, {
      duration: 2500,
    });
  }

  /**
   * Neutral picker: the area dragged over the shown frame (in the pixels of a `shown` image) turns grey, the
   * correction going to what the controls edit. False when there is no negative to pick from yet.
   */
  pickNeutral(dragged: DraggedRectangle, shown: { width: number; height: number }): boolean {
    const sheet = this.sheet();
    const n = this.negative();
    if (!sheet || !n) return false;
    const region = negativeRegion(dragged, shown, n);
    const params = previewParams(
      sheet.profile,
      n.scanner,
      n.base,
      n.levels,
      this.state().roll,
      this.frameAdjustments(),
    );
    const pick = pickNeutral({ width: n.width, height: n.height, data: n.pixels }, region, params);
    this.lastPickState.set(pick.wholePoints);
    this.change(withCorrection(this.editing(), pick.correction));
    return true;
  }

  /** Sends what changed since the last save, then renders the pending frames again and follows them. */
  save(): void {
    const sheet = this.sheet();
    if (!sheet || this.saving()) return;
    const saved = this.saved();
    const state = this.state();
    const calls: Observable<unknown>[] = [];
    if (!same(state.roll, saved.roll)) calls.push(this.api.saveRoll(sheet.roll.id, state.roll));
    for (const [id, a] of Object.entries(state.frames))
      if (!same(a, saved.frames[Number(id)])) calls.push(this.api.saveFrame(Number(id), a));
    this.savingState.set(true);
    this.saveProblemState.set(null);
    const render = this.api.invertPending(sheet.roll.id, this.rollLevels() ? 'roll' : 'frame');
    concat(calls.length ? forkJoin(calls) : concat(), render)
      .pipe(last())
      .subscribe({
        next: () => {
          this.savingState.set(false);
          this.saved.set(state);
          this.snack.open('Saved; the frames are rendering again', undefined, { duration: 3000 });
          this.refresh();
        },
        error: (err: unknown) => {
          // what was edited stays in the history and stays unsaved: saving again sends it all again
          this.savingState.set(false);
          this.saveProblemState.set(readProblem(err).message);
        },
      });
  }

  /** Reads the sheet again, and again every little while as long as frames are rendering (a bounded number of times). */
  private refresh(): void {
    const sheet = this.sheet();
    if (!sheet) return;
    const read = () => this.api.tuning(sheet.roll.id);
    const rendering = (s: RollTuning) =>
      s.frames.some((f) => f.status === 'queued' || f.status === 'inverting');
    this.renderPoll?.unsubscribe();
    this.renderPoll = read()
      .pipe(
        expand((next) => (rendering(next) ? timer(this.pollMs).pipe(switchMap(read)) : EMPTY)),
        take(RENDER_POLL_LIMIT),
      )
      .subscribe({
        next: (next) => this.sheetState.set(next),
        // a missed reading is no loss: the next save or a reload reads the sheet again
        error: () => undefined,
      });
  }

  /** Records the operator's decision on the selected frame, with the note. */
  review(decision: ReviewDecision): void {
    const frame = this.frame();
    if (!frame) return;
    this.api.review(frame.id, { decision, note: this.note().trim() }).subscribe({
      next: (result) => {
        this.sheetState.update(
          (s) =>
            s && {
              ...s,
              frames: s.frames.map((f) => (f.id === frame.id ? result.frame : f)),
              approved: result.rollApproved,
            },
        );
        this.note.set('');
        this.problemState.set(null);
      },
      error: (err: unknown) => this.problemState.set(readProblem(err).message),
    });
  }
}
