import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  type ElementRef,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  model,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import type { TuningFrame } from '@clearbase/contracts';
import type { Subscription } from 'rxjs';
import { outputFormatLabel } from '../orders/order-labels';
import { readProblem } from '../problem/read-problem';
import { actualPixelsPlacement, clampOffset, type FrameSpot, type ScreenPoint } from './actual-pixels';
import { TuningApi } from './tuning-api';

/** The 1:1 view: the spot of the frame to show under a point of the stage (stage pixels from its top left). */
export interface ActualView {
  spot: FrameSpot;
  anchor: ScreenPoint;
}

/** A frame's full-size JPEG held as an object URL, with the render it came from. */
interface FullSizeImage {
  frameId: number;
  renderedAt: string | null;
  url: string;
}

/** Where the full-size image sits: its size and offset in CSS pixels, and its size in image pixels. */
interface Placement {
  size: ScreenPoint;
  offset: ScreenPoint;
  pixels: ScreenPoint;
}

/**
 * The 1:1 view of the frame viewer: the frame's saved full-size render at one image pixel per screen pixel, the
 * chosen spot under the pointer, dragged to pan. It fills the stage it sits in while `view` is set, and keeps the
 * last image it fetched, so going back to the same render fetches nothing.
 */
@Component({
  selector: 'cb-actual-pixels-view',
  templateUrl: './actual-pixels-view.html',
  styleUrl: './actual-pixels-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ActualPixelsView {
  /** The frame shown. */
  readonly frame = input.required<TuningFrame | null>();
  /** Whether the tuning has changes the saved render does not show yet. */
  readonly unsaved = input(false);
  /** Where the view looks, or null while it is off; panning moves it, so the next frame opens at the same spot. */
  readonly view = model<ActualView | null>(null);

  private readonly api = inject(TuningApi);
  private readonly box = viewChild<ElementRef<HTMLElement>>('box');
  private readonly on = computed(() => this.view() !== null);
  private readonly image = signal<FullSizeImage | null>(null);
  private load: Subscription | null = null;
  private panFrom: { x: number; y: number; ox: number; oy: number } | null = null;

  protected readonly loading = signal(false);
  /** Why the last image could not be shown; cleared each time the view is turned on or off. */
  protected readonly problem = linkedSignal<boolean, string | null>({
    source: this.on,
    computation: () => null,
  });
  /** Unknown until the image's pixels are; again each time the view is turned on or off. */
  protected readonly placement = linkedSignal<boolean, Placement | null>({
    source: this.on,
    computation: () => null,
  });

  /** Why the frame cannot be shown at 1:1, or null when its full-size JPEG output is there. */
  protected readonly unavailable = computed<string | null>(() => {
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
  /** The full-size image when it is the shown frame's. */
  protected readonly shown = computed(() => {
    const image = this.image();
    return image && image.frameId === this.frame()?.id ? image : null;
  });
  /** Size and place of the full-size image on the stage, CSS pixels. */
  protected readonly imageBox = computed(() => {
    const placed = this.placement();
    return (
      placed && {
        width: placed.size.x,
        height: placed.size.y,
        transform: `translate(${placed.offset.x}px, ${placed.offset.y}px)`,
      }
    );
  });
  /** The line under the stage while the view is on. */
  readonly caption = computed(() => {
    const placed = this.placement();
    const size = placed ? `, ${placed.pixels.x}×${placed.pixels.y}` : '';
    return `1:1 · the saved render${size}${this.unsaved() ? ' · unsaved changes show here once saved' : ''}`;
  });

  constructor() {
    // while on, the frame's full-size JPEG (again when the frame was rendered again)
    effect(() => {
      const f = this.frame();
      if (!this.on() || !f || this.unavailable()) return;
      untracked(() => this.fetch(f));
    });
    effect(() => {
      if (!this.on()) this.panFrom = null;
    });
    inject(DestroyRef).onDestroy(() => {
      this.load?.unsubscribe();
      const image = this.image();
      if (image) URL.revokeObjectURL(image.url);
    });
  }

  private fetch(frame: TuningFrame): void {
    const have = this.image();
    if (have && have.frameId === frame.id && have.renderedAt === frame.renderedAt) return;
    this.load?.unsubscribe();
    this.loading.set(true);
    this.problem.set(null);
    this.load = this.api.fullSizeJpeg(frame.id).subscribe({
      next: (blob) => {
        this.loading.set(false);
        const old = this.image();
        if (old) URL.revokeObjectURL(old.url);
        this.placement.set(null);
        this.image.set({ frameId: frame.id, renderedAt: frame.renderedAt, url: URL.createObjectURL(blob) });
      },
      error: (err: unknown) => {
        this.loading.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }

  /** Places the full-size image once its pixels are known: the chosen spot under the pointer or the centre. */
  protected loaded(image: HTMLImageElement): void {
    const view = this.view();
    const box = this.box()?.nativeElement;
    if (!view || !box || !image.naturalWidth) return;
    const pixels = { x: image.naturalWidth, y: image.naturalHeight };
    const viewport = { x: box.clientWidth, y: box.clientHeight };
    const ratio = globalThis.devicePixelRatio || 1;
    this.placement.set({
      ...actualPixelsPlacement(view.spot, view.anchor, pixels, viewport, ratio),
      pixels,
    });
  }

  protected failed(): void {
    this.problem.set('The full-size render could not be shown. Press 1 again to try once more.');
    const image = this.image();
    if (image) URL.revokeObjectURL(image.url);
    this.image.set(null);
  }

  protected down(event: PointerEvent): void {
    const placed = this.placement();
    if (!placed) return;
    (event.target as Element).setPointerCapture?.(event.pointerId);
    this.panFrom = { x: event.clientX, y: event.clientY, ox: placed.offset.x, oy: placed.offset.y };
  }

  protected move(event: PointerEvent): void {
    const from = this.panFrom;
    const placed = this.placement();
    const box = this.box()?.nativeElement;
    if (!from || !placed || !box) return;
    const viewport = { x: box.clientWidth, y: box.clientHeight };
    const offset = clampOffset(
      { x: from.ox + event.clientX - from.x, y: from.oy + event.clientY - from.y },
      placed.size,
      viewport,
    );
    this.placement.set({ ...placed, offset });
    // the next frame opens at the same spot, under the centre
    const anchor = { x: viewport.x / 2, y: viewport.y / 2 };
    this.view.set({
      anchor,
      spot: { fx: (anchor.x - offset.x) / placed.size.x, fy: (anchor.y - offset.y) / placed.size.y },
    });
  }

  protected up(): void {
    this.panFrom = null;
  }
}
