import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  type ElementRef,
  computed,
  effect,
  inject,
  input,
  signal,
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
import { concat, forkJoin, last, type Observable, type Subscription } from 'rxjs';
import { readProblem } from '../problem/read-problem';
import type { PreviewImage } from '../preview/preview-renderer';
import { PreviewRenderer } from '../preview/preview-renderer';
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

/** The three casts in the positive's terms (positive values: more red, green, blue). */
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
  host: { '(document:keydown)': 'onKey($event)' },
})
export class RollWorkspacePage {
  /** The roll id, from the route. */
  readonly id = input.required<string>();

  private readonly api = inject(TuningApi);
  private readonly snack = inject(MatSnackBar);
  protected readonly preview = inject(PreviewRenderer);
  protected readonly castAxes = castAxes;
  protected readonly keys = tuningKeys;

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

  private readonly stage = viewChild<ElementRef<HTMLElement>>('stage');
  private readonly beforeCanvas = viewChild<ElementRef<HTMLCanvasElement>>('beforeCanvas');
  private readonly afterCanvas = viewChild<ElementRef<HTMLCanvasElement>>('afterCanvas');
  private negativeLoad: Subscription | null = null;

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
    inject(DestroyRef).onDestroy(() => this.negativeLoad?.unsubscribe());
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
          this.saving.set(false);
          this.problem.set(readProblem(err).message);
        },
      });
  }

  private refresh(): void {
    const sheet = this.sheet();
    if (!sheet) return;
    this.api.tuning(sheet.roll.id).subscribe((next) => this.sheet.set(next));
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
    this.setZoom(this.zoom() * (event.deltaY < 0 ? 1.25 : 0.8));
  }

  protected setZoom(z: number): void {
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
      '+': () => this.setZoom(this.zoom() * 1.25),
      '=': () => this.setZoom(this.zoom() * 1.25),
      '-': () => this.setZoom(this.zoom() * 0.8),
      a: () => this.review('approved'),
      x: () => this.review('excluded'),
      s: () => this.save(),
      '?': () => this.helpOpen.update((v) => !v),
      Escape: () => this.helpOpen.set(false),
    };
    const run = actions[key.length === 1 ? key.toLowerCase() : key] ?? actions[key];
    if (run) {
      event.preventDefault();
      run();
    }
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
    if (a.exposureStops) parts.push(`${a.exposureStops > 0 ? '+' : ''}${a.exposureStops.toFixed(2)} st`);
    if (a.contrast !== null) parts.push(`γ× ${a.contrast}`);
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
  }
}
