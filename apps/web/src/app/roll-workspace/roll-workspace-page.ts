import { holdUnloadWithUnsavedChanges, type LeavesWithCare } from '../forms/unsaved-changes-guard';
import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  InjectionToken,
  type ElementRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { Adjustments, Balance, ReviewDecision, RollTuning, TuningFrame } from '@clearbase/contracts';
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
import { outputFormatLabel } from '../orders/order-labels';
import { readProblem } from '../problem/read-problem';
import type { PreviewImage } from '../preview/preview-renderer';
import { PreviewRenderer } from '../preview/preview-renderer';
import {
  actualPixelsPlacement,
  clampOffset,
  spotUnder,
  type FrameSpot,
  type ScreenPoint,
} from './actual-pixels';
import { stopsLabel } from './stops-label';
import { densityHistogram, positiveHistogram, type Histogram } from './histograms';
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

type ViewMode = 'split' | 'side-by-side' | 'toggle';

/** The 1:1 view: the spot of the frame to show under a point of the stage (stage pixels from its top left). */
interface ActualView {
  spot: FrameSpot;
  anchor: ScreenPoint;
}

/** A frame's full-size JPEG held as an object URL, with the render it came from. */
interface FullSizeImage {
  frameId: number;
  renderedAt: string | null;
  url: string;
}

/** Milliseconds between readings of the sheet while frames render again after a save; a test sets it short. */
export const RENDER_POLL_MS = new InjectionToken<number>('render poll interval', {
  providedIn: 'root',
  // every 2 s: soon enough to see a frame come back, light on the server: our choice
  factory: () => 2000,
});
// at most 90 readings, about 3 minutes at 2 s, a long roll's render: our choice
const RENDER_POLL_LIMIT = 90;

/** The three casts in the positive's terms (positive values: more red, green, blue). */
/** The black and white point controls: which shift each moves, and what a positive move does. */
const pointControls = [
  {
    key: 'blackPointStops',
    label: 'Black point',
    id: 'black-point',
    valueId: 'blackPoint',
    hint: '+ deeper blacks, − lifted shadows',
  },
  {
    key: 'whitePointStops',
    label: 'White point',
    id: 'white-point',
    valueId: 'whitePoint',
    hint: '+ dimmer highlights, − brighter highlights',
  },
] as const;

const castAxes = [
  { key: 'cyanRed', label: 'Cyan – red', hint: '+ redder, − more cyan' },
  { key: 'magentaGreen', label: 'Magenta – green', hint: '+ greener, − more magenta' },
  { key: 'yellowBlue', label: 'Yellow – blue', hint: '+ bluer, − more yellow' },
] as const;

/** Keys of the tuning screen, shown in its help panel. */
export const tuningKeys: readonly { keys: string; does: string }[] = [
  { keys: '← →', does: 'Previous or next frame' },
  { keys: 'B', does: 'Show before or after (in toggle view)' },
  { keys: 'V', does: 'Next view: split, side by side, toggle' },
  { keys: 'N', does: 'Neutral picker: drag over an area that should be grey' },
  { keys: 'F', does: 'Draw the film base region' },
  { keys: '0', does: 'Fit the frame; + and − zoom' },
  {
    keys: '1',
    does: 'Actual pixels (1:1) of the saved full-size render at the pointer; 1 or Esc again to fit',
  },
  { keys: 'Ctrl Z / Ctrl Shift Z', does: 'Undo / redo' },
  { keys: 'A / X', does: 'Approve / exclude the frame' },
  { keys: 'S', does: 'Save and render again' },
  { keys: '?', does: 'This help' },
];

const zero: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

/**
 * Staff: the tuning workspace of one roll. The selected frame's working negative renders live in a worker at the
 * server's levels, before (profile only) and after (with the roll's and the frame's adjustments); casts in whole
 * printer points, exposure in sixth stops, contrast; a neutral picker; undo and redo; saving renders on the server.
 */
@Component({
  selector: 'cb-roll-workspace-page',
  imports: [
    DecimalPipe,
    FormsModule,
    RouterLink,
    MatButton,
    MatIconButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatIcon,
    MatProgressBar,
    MatSlideToggle,
  ],
  providers: [PreviewRenderer],
  templateUrl: './roll-workspace-page.html',
  styleUrl: './roll-workspace-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(document:keydown)': 'onKey($event)',
    '(window:beforeunload)': 'holdUnload($event)',
  },
})
export class RollWorkspacePage implements LeavesWithCare {
  /** The roll id, from the route. */
  readonly id = input.required<string>();

  private readonly api = inject(TuningApi);
  private readonly snack = inject(MatSnackBar);
  private readonly pollMs = inject(RENDER_POLL_MS);
  protected readonly preview = inject(PreviewRenderer);
  protected readonly castAxes = castAxes;
  protected readonly pointControls = pointControls;
  protected readonly keys = tuningKeys;
  protected readonly stopsLabel = stopsLabel;

  protected readonly sheet = signal<RollTuning | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly frameId = signal<number | null>(null);
  protected readonly negative = signal<WorkingNegative | null>(null);
  protected readonly loadingNegative = signal(false);
  protected readonly history = signal(startHistory({ roll: zero, frames: {} }));
  protected readonly saved = signal<TuningState>({ roll: zero, frames: {} });
  protected readonly target = signal<'frame' | 'roll'>('frame');
  protected readonly rollLevels = signal(false);
  protected readonly selected = signal<ReadonlySet<number>>(new Set());
  protected readonly view = signal<ViewMode>('split');
  protected readonly showBefore = signal(false);
  protected readonly split = signal(50);
  protected readonly zoom = signal(1);
  protected readonly pan = signal({ x: 0, y: 0 });
  protected readonly tool = signal<'pan' | 'pick'>('pan');
  protected readonly showBase = signal(false);
  protected readonly drag = signal<DraggedRectangle | null>(null);
  protected readonly helpOpen = signal(false);
  protected readonly saving = signal(false);
  protected readonly note = signal('');
  protected readonly lastPick = signal<Balance | null>(null);
  protected readonly saveProblem = signal<string | null>(null);
  /** On while the stage shows the saved full-size render at one image pixel per screen pixel. */
  protected readonly actual = signal<ActualView | null>(null);
  protected readonly actualImage = signal<FullSizeImage | null>(null);
  protected readonly actualLoading = signal(false);
  protected readonly actualProblem = signal<string | null>(null);
  protected readonly actualPlacement = signal<{
    size: ScreenPoint;
    offset: ScreenPoint;
    pixels: ScreenPoint;
  } | null>(null);

  private readonly stage = viewChild<ElementRef<HTMLElement>>('stage');
  private readonly beforeCanvas = viewChild<ElementRef<HTMLCanvasElement>>('beforeCanvas');
  private readonly afterCanvas = viewChild<ElementRef<HTMLCanvasElement>>('afterCanvas');
  private negativeLoad: Subscription | null = null;
  private actualLoad: Subscription | null = null;
  private renderPoll: Subscription | null = null;
  /** The last pointer position over the stage, in client pixels; null when the pointer is elsewhere. */
  private lastPointer: ScreenPoint | null = null;

  protected readonly frames = computed(() => this.sheet()?.frames ?? []);
  protected readonly frame = computed(() => this.frames().find((f) => f.id === this.frameId()) ?? null);
  protected readonly state = computed(() => this.history().present);
  protected readonly editTarget = computed<TuningTarget | null>(() => {
    const id = this.frameId();
    return this.target() === 'roll' ? { kind: 'roll' } : id === null ? null : { kind: 'frame', frameId: id };
  });
  /** The adjustments the controls show and edit. */
  protected readonly editing = computed<Adjustments>(() => {
    const t = this.editTarget();
    return (t && adjustmentsOf(this.state(), t)) ?? zero;
  });
  protected readonly frameAdjustments = computed(() => {
    const id = this.frameId();
    return (id !== null && this.state().frames[id]) || zero;
  });
  protected readonly unsaved = computed(() => JSON.stringify(this.state()) !== JSON.stringify(this.saved()));

  readonly leaveQuestion = 'This roll has unsaved tuning. Leave and lose it?';

  hasUnsavedChanges(): boolean {
    return this.unsaved();
  }

  protected holdUnload(event: BeforeUnloadEvent): void {
    holdUnloadWithUnsavedChanges(this, event);
  }
  protected readonly canUndo = computed(() => this.history().past.length > 0);
  protected readonly canRedo = computed(() => this.history().future.length > 0);
  protected readonly densityBars = computed<Histogram | null>(() => {
    const n = this.negative();
    return n ? densityHistogram(n.pixels, n.base) : null;
  });
  protected readonly positiveBars = computed<Histogram | null>(() => {
    const image = this.preview.after();
    return image ? positiveHistogram(image.rgba) : null;
  });
  /** Why the selected frame cannot be shown at 1:1, or null when its full-size JPEG output is there. */
  protected readonly actualUnavailable = computed<string | null>(() => {
    const f = this.frame();
    if (!f) return null;
    if (f.status !== 'done')
      return `Frame ${f.index} is rendering; 1:1 shows its full-size output once it is done.`;
    if (!f.outputs.includes('jpeg')) {
      const made = f.outputs.map(outputFormatLabel).join(' and ');
      return made
        ? `1:1 needs a full-size JPEG output; this roll was rendered to ${made} only.`
        : '1:1 needs a full-size JPEG output; this frame has none yet.';
    }
    return null;
  });
  /** The full-size image when it is the selected frame's. */
  protected readonly actualShown = computed(() => {
    const image = this.actualImage();
    return image && image.frameId === this.frameId() ? image : null;
  });
  /** Size and place of the full-size image on the stage, CSS pixels. */
  protected readonly actualBox = computed(() => {
    const placed = this.actualPlacement();
    return (
      placed && {
        width: placed.size.x,
        height: placed.size.y,
        transform: `translate(${placed.offset.x}px, ${placed.offset.y}px)`,
      }
    );
  });
  protected readonly actualCaption = computed(() => {
    const placed = this.actualPlacement();
    const size = placed ? `, ${placed.pixels.x}×${placed.pixels.y}` : '';
    return `1:1 · the saved render${size}${this.unsaved() ? ' · unsaved changes show here once saved' : ''}`;
  });
  protected readonly baseBox = computed(() => {
    const f = this.frame();
    const n = this.negative();
    const r = f?.base.measured?.region ?? f?.base.region;
    if (!f || !n || !r) return null;
    return {
      left: (100 * r.x) / f.width,
      top: (100 * r.y) / f.height,
      width: (100 * r.width) / f.width,
      height: (100 * r.height) / f.height,
    };
  });

  constructor() {
    effect((onCleanup) => {
      const sub = this.api.tuning(Number(this.id())).subscribe({
        next: (sheet) => this.takeSheet(sheet),
        error: (err: unknown) => this.problem.set(readProblem(err).message),
      });
      onCleanup(() => sub.unsubscribe());
    });
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
    effect(() => this.draw(this.beforeCanvas()?.nativeElement, this.preview.before()));
    effect(() => this.draw(this.afterCanvas()?.nativeElement, this.preview.after()));
    // where the pointer is over the stage, for 1:1: plain listeners, as following the pointer changes nothing shown
    effect((onCleanup) => {
      const stage = this.stage()?.nativeElement;
      if (!stage) return;
      const move = (e: PointerEvent) => (this.lastPointer = { x: e.clientX, y: e.clientY });
      const leave = () => (this.lastPointer = null);
      stage.addEventListener('pointermove', move, { passive: true });
      stage.addEventListener('pointerleave', leave);
      onCleanup(() => {
        stage.removeEventListener('pointermove', move);
        stage.removeEventListener('pointerleave', leave);
      });
    });
    // in 1:1, the selected frame's full-size JPEG (again when the frame was rendered again)
    effect(() => {
      const on = this.actual() !== null;
      const f = this.frame();
      if (!on || !f || this.actualUnavailable()) return;
      untracked(() => this.loadActual(f));
    });
    inject(DestroyRef).onDestroy(() => {
      this.negativeLoad?.unsubscribe();
      this.actualLoad?.unsubscribe();
      this.renderPoll?.unsubscribe();
      const image = this.actualImage();
      if (image) URL.revokeObjectURL(image.url);
    });
  }

  private takeSheet(sheet: RollTuning): void {
    this.sheet.set(sheet);
    const state: TuningState = {
      roll: sheet.roll.adjustments,
      frames: Object.fromEntries(sheet.frames.map((f) => [f.id, f.adjustments])),
    };
    this.saved.set(state);
    this.history.set(startHistory(state));
    if (this.frameId() === null && sheet.frames[0]) this.selectFrame(sheet.frames[0].id);
  }

  protected selectFrame(id: number): void {
    const sheet = this.sheet();
    if (!sheet || id === this.frameId()) return;
    this.frameId.set(id);
    this.negative.set(null);
    this.loadingNegative.set(true);
    this.negativeLoad?.unsubscribe();
    this.negativeLoad = this.api.workingNegative(id, sheet.scanner).subscribe({
      next: (n) => {
        this.loadingNegative.set(false);
        // the worker takes the pixels; the page keeps its own copy for the picker and the histogram
        const copy = { ...n, pixels: n.pixels.slice() };
        this.negative.set(n);
        this.preview.load(copy, sheet.profile, n.levels);
        this.preview.render('before', previewProfile(sheet.profile, n.levels, zero, zero));
      },
      error: (err: unknown) => {
        this.loadingNegative.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }

  protected step(delta: number): void {
    const list = this.frames();
    const at = list.findIndex((f) => f.id === this.frameId());
    const next = list[Math.min(list.length - 1, Math.max(0, at + delta))];
    if (next) this.selectFrame(next.id);
  }

  private dispatch(action: HistoryAction): void {
    this.history.update((h) => historyReducer(h, action));
  }

  protected change(patch: Partial<Adjustments>): void {
    const t = this.editTarget();
    if (t) this.dispatch({ type: 'set', target: t, adjustments: { ...this.editing(), ...patch } });
  }

  protected changeCast(axis: keyof Balance, value: number): void {
    this.change({ balance: { ...this.editing().balance, [axis]: Math.round(value) } });
  }

  protected changeExposure(sixths: number): void {
    this.change({ exposureStops: Math.round(sixths) / 6 });
  }

  /** Moves the black or the white point, in sixths of a stop. */
  protected changePoint(point: 'blackPointStops' | 'whitePointStops', sixths: number): void {
    this.change({ [point]: Math.round(sixths) / 6 });
  }

  protected changeContrast(value: number | null): void {
    this.change({ contrast: value === null ? null : Math.round(value * 100) / 100 });
  }

  protected undo(): void {
    this.dispatch({ type: 'undo' });
  }

  protected redo(): void {
    this.dispatch({ type: 'redo' });
  }

  /** Back to zero adjustments for what the controls edit. */
  protected reset(): void {
    const t = this.editTarget();
    if (t) this.dispatch({ type: 'set', target: t, adjustments: zero });
  }

  protected toggleSelected(id: number): void {
    this.selected.update((s) => {
      const next = new Set(s);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  }

  protected copyToSelected(): void {
    const ids = [...this.selected()].filter((id) => id !== this.frameId());
    this.dispatch({ type: 'copy', from: this.frameAdjustments(), frameIds: ids });
    this.snack.open(`Copied to ${ids.length} frame${ids.length === 1 ? '' : 's'}`, undefined, {
      duration: 2500,
    });
  }

  protected save(): void {
    const sheet = this.sheet();
    if (!sheet || this.saving()) return;
    const saved = this.saved();
    const state = this.state();
    const calls: Observable<unknown>[] = [];
    if (JSON.stringify(state.roll) !== JSON.stringify(saved.roll))
      calls.push(this.api.saveRoll(sheet.roll.id, state.roll));
    for (const [id, a] of Object.entries(state.frames))
      if (JSON.stringify(a) !== JSON.stringify(saved.frames[Number(id)]))
        calls.push(this.api.saveFrame(Number(id), a));
    this.saving.set(true);
    this.saveProblem.set(null);
    const render = this.api.invertPending(sheet.roll.id, this.rollLevels() ? 'roll' : 'frame');
    concat(calls.length ? forkJoin(calls) : concat(), render)
      .pipe(last())
      .subscribe({
        next: () => {
          this.saving.set(false);
          this.saved.set(state);
          this.snack.open('Saved; the frames are rendering again', undefined, { duration: 3000 });
          this.refresh();
        },
        error: (err: unknown) => {
          // what was edited stays in the history and stays unsaved: saving again sends it all again
          this.saving.set(false);
          this.saveProblem.set(readProblem(err).message);
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
        next: (next) => this.sheet.set(next),
        // a missed reading is no loss: the next save or a reload reads the sheet again
        error: () => undefined,
      });
  }

  protected review(decision: ReviewDecision): void {
    const frame = this.frame();
    if (!frame) return;
    this.api.review(frame.id, { decision, note: this.note().trim() }).subscribe({
      next: (result) => {
        this.sheet.update(
          (s) =>
            s && {
              ...s,
              frames: s.frames.map((f) => (f.id === frame.id ? result.frame : f)),
              approved: result.rollApproved,
            },
        );
        this.note.set('');
        this.problem.set(null);
      },
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }

  // --- viewer: pointer, zoom, pan, picker

  private pointer(event: PointerEvent): { x: number; y: number } {
    const canvas = this.afterCanvas()?.nativeElement;
    const rect = canvas!.getBoundingClientRect();
    return {
      x: ((event.clientX - rect.left) / rect.width) * canvas!.width,
      y: ((event.clientY - rect.top) / rect.height) * canvas!.height,
    };
  }

  private panFrom: { x: number; y: number; px: number; py: number } | null = null;

  protected pointerDown(event: PointerEvent): void {
    (event.target as Element).setPointerCapture?.(event.pointerId);
    if (this.tool() === 'pick') {
      const p = this.pointer(event);
      this.drag.set({ x0: p.x, y0: p.y, x1: p.x, y1: p.y });
    } else {
      this.panFrom = { x: event.clientX, y: event.clientY, px: this.pan().x, py: this.pan().y };
    }
  }

  protected pointerMove(event: PointerEvent): void {
    const d = this.drag();
    if (d) {
      const p = this.pointer(event);
      this.drag.set({ ...d, x1: p.x, y1: p.y });
    } else if (this.panFrom) {
      const from = this.panFrom;
      this.pan.set({ x: from.px + event.clientX - from.x, y: from.py + event.clientY - from.y });
    }
  }

  protected pointerUp(): void {
    this.panFrom = null;
    const d = this.drag();
    if (!d) return;
    this.drag.set(null);
    this.pickArea(d);
  }

  /** Neutral picker: the area under the drag turns grey, the points going to what the controls edit. */
  protected pickArea(d: DraggedRectangle): void {
    const sheet = this.sheet();
    const n = this.negative();
    const canvas = this.afterCanvas()?.nativeElement;
    if (!sheet || !n || !canvas) return;
    const region = negativeRegion(d, { width: canvas.width, height: canvas.height }, n);
    const params = previewParams(
      sheet.profile,
      n.scanner,
      n.base,
      n.levels,
      this.state().roll,
      this.frameAdjustments(),
    );
    const pick = pickNeutral({ width: n.width, height: n.height, data: n.pixels }, region, params);
    this.lastPick.set(pick.wholePoints);
    this.change(withCorrection(this.editing(), pick.correction));
    this.tool.set('pan');
  }

  protected dragBox = computed(() => {
    const d = this.drag();
    const canvas = this.afterCanvas()?.nativeElement;
    if (!d || !canvas || !canvas.width) return null;
    return {
      left: (100 * Math.min(d.x0, d.x1)) / canvas.width,
      top: (100 * Math.min(d.y0, d.y1)) / canvas.height,
      width: (100 * Math.abs(d.x1 - d.x0)) / canvas.width,
      height: (100 * Math.abs(d.y1 - d.y0)) / canvas.height,
    };
  });

  protected wheel(event: WheelEvent): void {
    event.preventDefault();
    // in 1:1, scrolling out goes back to the fitted frame; scrolling in stays
    if (this.actual()) {
      if (event.deltaY > 0) this.setZoom(1);
      return;
    }
    this.setZoom(this.zoom() * (event.deltaY < 0 ? 1.25 : 0.8));
  }

  protected setZoom(z: number): void {
    this.leaveActual();
    // 1/2× to 16× spans a whole-frame look to grain at 1:1 on a 1500 px negative: our choice
    this.zoom.set(Math.min(16, Math.max(0.5, z)));
    if (z <= 1) this.pan.set({ x: 0, y: 0 });
  }

  protected splitDown(event: PointerEvent): void {
    event.stopPropagation();
    const stage = this.stage()?.nativeElement;
    if (!stage) return;
    (event.target as Element).setPointerCapture?.(event.pointerId);
    const move = (e: PointerEvent) => {
      const rect = stage.getBoundingClientRect();
      this.split.set(Math.min(100, Math.max(0, (100 * (e.clientX - rect.left)) / rect.width)));
    };
    const up = () => {
      window.removeEventListener('pointermove', move);
      window.removeEventListener('pointerup', up);
    };
    window.addEventListener('pointermove', move);
    window.addEventListener('pointerup', up);
  }

  protected onKey(event: KeyboardEvent): void {
    const tag = (event.target as HTMLElement | null)?.tagName;
    if (tag === 'INPUT' || tag === 'TEXTAREA' || tag === 'SELECT') return;
    const key = event.key;
    const ctrl = event.ctrlKey || event.metaKey;
    if (ctrl && key.toLowerCase() === 'z') {
      event.preventDefault();
      if (event.shiftKey) this.redo();
      else this.undo();
      return;
    }
    if (ctrl) return;
    const actions: Record<string, () => void> = {
      ArrowLeft: () => this.step(-1),
      ArrowRight: () => this.step(1),
      b: () => this.showBefore.update((v) => !v),
      v: () =>
        this.view.update((v) => (v === 'split' ? 'side-by-side' : v === 'side-by-side' ? 'toggle' : 'split')),
      n: () => this.tool.update((t) => (t === 'pick' ? 'pan' : 'pick')),
      f: () => this.showBase.update((v) => !v),
      '0': () => this.setZoom(1),
      '1': () => this.toggleActual(),
      '+': () => this.setZoom(this.zoom() * 1.25),
      '=': () => this.setZoom(this.zoom() * 1.25),
      '-': () => this.setZoom(this.zoom() * 0.8),
      a: () => this.review('approved'),
      x: () => this.review('excluded'),
      s: () => this.save(),
      '?': () => this.helpOpen.update((v) => !v),
      Escape: () => (this.helpOpen() ? this.helpOpen.set(false) : this.leaveActual()),
    };
    const run = actions[key.length === 1 ? key.toLowerCase() : key] ?? actions[key];
    if (run) {
      event.preventDefault();
      run();
    }
  }

  // --- 1:1: the saved full-size render at one image pixel per screen pixel

  /** 1:1 at the spot under the pointer (or under the stage's centre), or back to the fitted frame. */
  protected toggleActual(): void {
    if (this.actual()) {
      this.leaveActual();
      return;
    }
    const stage = this.stage()?.nativeElement;
    if (!stage) return;
    const box = stage.getBoundingClientRect();
    const inside = (p: ScreenPoint | null, r: DOMRect) =>
      p !== null && p.x >= r.left && p.x <= r.right && p.y >= r.top && p.y <= r.bottom;
    const pointer = inside(this.lastPointer, box) ? this.lastPointer : null;
    const at = pointer ?? { x: box.left + box.width / 2, y: box.top + box.height / 2 };
    const drawn = [this.afterCanvas(), this.beforeCanvas()]
      .map((c) => c?.nativeElement.getBoundingClientRect())
      .filter((r): r is DOMRect => !!r && r.width > 0 && r.height > 0);
    const under = drawn.find((r) => inside(at, r)) ?? drawn[0] ?? null;
    this.actualProblem.set(null);
    this.actualPlacement.set(null);
    this.actual.set({
      spot: spotUnder(at, under),
      anchor: { x: at.x - box.left, y: at.y - box.top },
    });
  }

  protected leaveActual(): void {
    this.actual.set(null);
    this.actualPlacement.set(null);
    this.actualPanFrom = null;
  }

  private loadActual(frame: TuningFrame): void {
    const have = this.actualImage();
    if (have && have.frameId === frame.id && have.renderedAt === frame.renderedAt) return;
    this.actualLoad?.unsubscribe();
    this.actualLoading.set(true);
    this.actualProblem.set(null);
    this.actualLoad = this.api.fullSizeJpeg(frame.id).subscribe({
      next: (blob) => {
        this.actualLoading.set(false);
        const old = this.actualImage();
        if (old) URL.revokeObjectURL(old.url);
        this.actualPlacement.set(null);
        this.actualImage.set({
          frameId: frame.id,
          renderedAt: frame.renderedAt,
          url: URL.createObjectURL(blob),
        });
      },
      error: (err: unknown) => {
        this.actualLoading.set(false);
        this.actualProblem.set(readProblem(err).message);
      },
    });
  }

  /** Places the full-size image once its pixels are known: the chosen spot under the pointer or the centre. */
  protected actualLoaded(image: HTMLImageElement): void {
    const view = this.actual();
    const stage = this.stage()?.nativeElement;
    if (!view || !stage || !image.naturalWidth) return;
    const pixels = { x: image.naturalWidth, y: image.naturalHeight };
    const viewport = { x: stage.clientWidth, y: stage.clientHeight };
    const ratio = globalThis.devicePixelRatio || 1;
    this.actualPlacement.set({
      ...actualPixelsPlacement(view.spot, view.anchor, pixels, viewport, ratio),
      pixels,
    });
  }

  protected actualFailed(): void {
    this.actualProblem.set('The full-size render could not be shown. Press 1 again to try once more.');
    const image = this.actualImage();
    if (image) URL.revokeObjectURL(image.url);
    this.actualImage.set(null);
  }

  private actualPanFrom: { x: number; y: number; ox: number; oy: number } | null = null;

  protected actualDown(event: PointerEvent): void {
    const placed = this.actualPlacement();
    if (!placed) return;
    (event.target as Element).setPointerCapture?.(event.pointerId);
    this.actualPanFrom = { x: event.clientX, y: event.clientY, ox: placed.offset.x, oy: placed.offset.y };
  }

  protected actualMove(event: PointerEvent): void {
    const from = this.actualPanFrom;
    const placed = this.actualPlacement();
    const stage = this.stage()?.nativeElement;
    if (!from || !placed || !stage) return;
    const viewport = { x: stage.clientWidth, y: stage.clientHeight };
    const offset = clampOffset(
      { x: from.ox + event.clientX - from.x, y: from.oy + event.clientY - from.y },
      placed.size,
      viewport,
    );
    this.actualPlacement.set({ ...placed, offset });
    // the next frame opens at the same spot, under the centre
    const anchor = { x: viewport.x / 2, y: viewport.y / 2 };
    this.actual.set({
      anchor,
      spot: { fx: (anchor.x - offset.x) / placed.size.x, fy: (anchor.y - offset.y) / placed.size.y },
    });
  }

  protected actualUp(): void {
    this.actualPanFrom = null;
  }

  protected thumbnail(frame: TuningFrame): string {
    return frame.status === 'done'
      ? `/api/frames/${frame.id}/preview?at=${frame.renderedAt ?? ''}`
      : `/api/frames/${frame.id}/negative-preview`;
  }

  protected carries(frame: TuningFrame): string {
    const a = this.state().frames[frame.id] ?? frame.adjustments;
    const parts: string[] = [];
    const b = a.balance;
    if (b.cyanRed) parts.push(`CR ${b.cyanRed > 0 ? '+' : ''}${b.cyanRed}`);
    if (b.magentaGreen) parts.push(`MG ${b.magentaGreen > 0 ? '+' : ''}${b.magentaGreen}`);
    if (b.yellowBlue) parts.push(`YB ${b.yellowBlue > 0 ? '+' : ''}${b.yellowBlue}`);
    if (a.exposureStops) parts.push(stopsLabel(a.exposureStops));
    if (a.contrast !== null) parts.push(`γ× ${a.contrast}`);
    if (a.blackPointStops) parts.push(`black ${stopsLabel(a.blackPointStops)}`);
    if (a.whitePointStops) parts.push(`white ${stopsLabel(a.whitePointStops)}`);
    return parts.join(' · ');
  }

  protected sixths(stops: number): number {
    return Math.round(stops * 6);
  }

  protected histogramPath(h: Histogram, channel: 0 | 1 | 2): string {
    const bins = h.bins[channel]!;
    const top = h.peak || 1;
    let d = `M0,40`;
    bins.forEach((v, i) => (d += ` L${(i * 100) / (bins.length - 1)},${40 - (40 * v) / top}`));
    return `${d} L100,40 Z`;
  }

  private draw(canvas: HTMLCanvasElement | undefined, image: PreviewImage | null): void {
    if (!canvas || !image) return;
    canvas.width = image.width;
    canvas.height = image.height;
    // jsdom has no 2D context; browsers always do
    canvas
      .getContext('2d')
      ?.putImageData(
        new ImageData(image.rgba as Uint8ClampedArray<ArrayBuffer>, image.width, image.height),
        0,
        0,
      );
    // renderings drawn so far: the next one is a change of this count, even when it took the same milliseconds
    canvas.dataset['renderCount'] = String(Number(canvas.dataset['renderCount'] ?? 0) + 1);
  }
}
