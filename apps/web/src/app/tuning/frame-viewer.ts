import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  type ElementRef,
  computed,
  effect,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatIcon } from '@angular/material/icon';
import type { PreviewImage } from '../preview/preview-renderer';
import { PreviewRenderer } from '../preview/preview-renderer';
import { spotUnder, type ScreenPoint } from './actual-pixels';
import { ActualPixelsView, type ActualView } from './actual-pixels-view';
import type { DraggedRectangle } from './neutral-pick';
import { TuningSession } from './tuning-session';

type ViewMode = 'split' | 'side-by-side' | 'toggle';

const nextViewMode: Record<ViewMode, ViewMode> = {
  split: 'side-by-side',
  'side-by-side': 'toggle',
  toggle: 'split',
};

/**
 * The frame viewer of the tuning screen: the selected frame before (profile only) and after (with the tuning) as the
 * preview worker draws them, split, side by side or toggled; zoom and pan; the neutral picker's drag; the film base
 * rectangle; and the 1:1 view of the saved full-size render.
 */
@Component({
  selector: 'cb-frame-viewer',
  imports: [
    DecimalPipe,
    MatButton,
    MatIconButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatIcon,
    ActualPixelsView,
  ],
  templateUrl: './frame-viewer.html',
  styleUrl: './frame-viewer.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameViewer {
  protected readonly session = inject(TuningSession);
  protected readonly preview = inject(PreviewRenderer);

  protected readonly view = signal<ViewMode>('split');
  protected readonly showBefore = signal(false);
  protected readonly split = signal(50);
  protected readonly zoom = signal(1);
  protected readonly pan = signal({ x: 0, y: 0 });
  protected readonly tool = signal<'pan' | 'pick'>('pan');
  protected readonly showBase = signal(false);
  protected readonly drag = signal<DraggedRectangle | null>(null);
  /** On while the stage shows the saved full-size render at one image pixel per screen pixel. */
  protected readonly actual = signal<ActualView | null>(null);

  private readonly stage = viewChild<ElementRef<HTMLElement>>('stage');
  private readonly beforeCanvas = viewChild<ElementRef<HTMLCanvasElement>>('beforeCanvas');
  private readonly afterCanvas = viewChild<ElementRef<HTMLCanvasElement>>('afterCanvas');
  protected readonly actualView = viewChild(ActualPixelsView);
  /** The last pointer position over the stage, in client pixels; null when the pointer is elsewhere. */
  private lastPointer: ScreenPoint | null = null;
  private panFrom: { x: number; y: number; px: number; py: number } | null = null;

  protected readonly baseBox = computed(() => {
    const f = this.session.frame();
    const n = this.session.negative();
    const r = f?.base.measured?.region ?? f?.base.region;
    if (!f || !n || !r) return null;
    return {
      left: (100 * r.x) / f.width,
      top: (100 * r.y) / f.height,
      width: (100 * r.width) / f.width,
      height: (100 * r.height) / f.height,
    };
  });

  protected readonly dragBox = computed(() => {
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

  constructor() {
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
  }

  /** Before or after, in the toggle view. */
  toggleBefore(): void {
    this.showBefore.update((v) => !v);
  }

  /** Split, then side by side, then toggle, then split again. */
  nextView(): void {
    this.view.update((v) => nextViewMode[v]);
  }

  togglePicker(): void {
    this.tool.update((t) => (t === 'pick' ? 'pan' : 'pick'));
  }

  toggleBase(): void {
    this.showBase.update((v) => !v);
  }

  /** Zoom by `factor` from where it is. */
  zoomBy(factor: number): void {
    this.setZoom(this.zoom() * factor);
  }

  protected setZoom(z: number): void {
    this.leaveActual();
    // 1/2× to 16× spans a whole-frame look to grain at 1:1 on a 1500 px negative: our choice
    this.zoom.set(Math.min(16, Math.max(0.5, z)));
    if (z <= 1) this.pan.set({ x: 0, y: 0 });
  }

  /** The whole frame in view. */
  fit(): void {
    this.setZoom(1);
  }

  /** 1:1 at the spot under the pointer (or under the stage's centre), or back to the fitted frame. */
  toggleActual(): void {
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
    this.actual.set({ spot: spotUnder(at, under), anchor: { x: at.x - box.left, y: at.y - box.top } });
  }

  /** Back from 1:1 to the fitted frame. */
  leaveActual(): void {
    this.actual.set(null);
  }

  private pointer(event: PointerEvent): { x: number; y: number } {
    const canvas = this.afterCanvas()?.nativeElement;
    const rect = canvas!.getBoundingClientRect();
    return {
      x: ((event.clientX - rect.left) / rect.width) * canvas!.width,
      y: ((event.clientY - rect.top) / rect.height) * canvas!.height,
    };
  }

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
    const canvas = this.afterCanvas()?.nativeElement;
    if (canvas && this.session.pickNeutral(d, { width: canvas.width, height: canvas.height }))
      this.tool.set('pan');
  }

  protected wheel(event: WheelEvent): void {
    event.preventDefault();
    // in 1:1, scrolling out goes back to the fitted frame; scrolling in stays
    if (this.actual()) {
      if (event.deltaY > 0) this.setZoom(1);
      return;
    }
    this.setZoom(this.zoom() * (event.deltaY < 0 ? 1.25 : 0.8));
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
