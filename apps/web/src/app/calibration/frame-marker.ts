import { ChangeDetectionStrategy, Component, computed, input, model, signal } from '@angular/core';
import type { FramePoint, PixelRegion } from '@clearbase/contracts';
import { chartOverlay, clientToFrame, cornerNames, rectangleBetween } from './chart-overlay';

/**
 * A frame's preview with marks drawn over it in frame pixels (an SVG whose viewBox is the full-size frame): in
 * `corners` mode each click sets the next chart corner and the perspective grid with every sampling area follows;
 * in `rectangle` mode a drag draws the grey rectangle.
 */
@Component({
  selector: 'cb-frame-marker',
  template: `
    <div class="frame" [style.aspect-ratio]="width() + ' / ' + height()">
      <img [src]="src()" alt="" draggable="false" />
      <svg
        [attr.viewBox]="'0 0 ' + width() + ' ' + height()"
        preserveAspectRatio="none"
        [attr.data-testid]="testId()"
        tabindex="0"
        [attr.aria-label]="
          mode() === 'corners'
            ? 'Chart frame: click the corners; Backspace takes the last one back'
            : 'Grey frame: drag the grey rectangle'
        "
        (click)="onClick($event)"
        (keydown)="onKey($event)"
        (pointerdown)="onDown($event)"
        (pointermove)="onMove($event)"
        (pointerup)="onUp($event)"
      >
        @for (p of grid(); track p.index) {
          <polygon class="cell" [attr.points]="p.cell" />
          <polygon class="sample" [attr.points]="p.sample" data-testid="sample-area" />
        }
        @for (c of corners(); track $index) {
          <circle class="corner" [attr.cx]="c[0]" [attr.cy]="c[1]" [attr.r]="markSize()" />
          <text
            class="corner-label"
            [attr.x]="c[0] + markSize() * 1.5"
            [attr.y]="c[1]"
            [attr.font-size]="markSize() * 3"
          >
            {{ $index + 1 }}
          </text>
        }
        @if (shownRegion(); as r) {
          <rect
            class="grey"
            [attr.x]="r.x"
            [attr.y]="r.y"
            [attr.width]="r.width"
            [attr.height]="r.height"
            data-testid="grey-rectangle"
          />
        }
      </svg>
    </div>
    @if (mode() === 'corners') {
      <p class="hint" data-testid="corner-hint">
        @if (corners().length < 4) {
          Click the chart's corner by {{ cornerNames[corners().length] }}.
        } @else {
          All four corners set: every patch's sampling area is drawn. Click again to start over.
        }
      </p>
    } @else {
      <p class="hint">Drag a rectangle over the grey card.</p>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .frame {
      position: relative;
      width: 100%;
      max-width: 720px;
      background: #222;
    }
    img,
    svg {
      position: absolute;
      inset: 0;
      width: 100%;
      height: 100%;
      user-select: none;
    }
    svg {
      cursor: crosshair;
      touch-action: none;
    }
    .cell {
      fill: none;
      stroke: #ffeb3b;
      stroke-width: 1;
      vector-effect: non-scaling-stroke;
    }
    .sample {
      fill: rgba(0, 229, 255, 0.25);
      stroke: #00e5ff;
      stroke-width: 1;
      vector-effect: non-scaling-stroke;
    }
    .corner {
      fill: #ff4081;
    }
    .corner-label {
      fill: #ff4081;
    }
    .grey {
      fill: rgba(0, 229, 255, 0.2);
      stroke: #00e5ff;
      stroke-width: 2;
      vector-effect: non-scaling-stroke;
    }
    .hint {
      color: var(--mat-sys-on-surface-variant);
      margin: 4px 0 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameMarker {
  readonly src = input.required<string>();
  /** Full-size frame, pixels. */
  readonly width = input.required<number>();
  readonly height = input.required<number>();
  readonly mode = input.required<'corners' | 'rectangle'>();
  readonly testId = input('frame-marker');
  readonly corners = model<FramePoint[]>([]);
  readonly region = model<PixelRegion | null>(null);

  protected readonly cornerNames = cornerNames;
  private readonly dragFrom = signal<FramePoint | null>(null);
  private readonly dragTo = signal<FramePoint | null>(null);

  protected readonly grid = computed(() => (this.mode() === 'corners' ? chartOverlay(this.corners()) : []));
  protected readonly markSize = computed(() => Math.max(1, Math.max(this.width(), this.height()) / 150));
  protected readonly shownRegion = computed(() => {
    if (this.mode() !== 'rectangle') return null;
    const a = this.dragFrom(),
      b = this.dragTo();
    return a && b ? rectangleBetween(a, b, this.frame()) : this.region();
  });

  private frame() {
    return { width: this.width(), height: this.height() };
  }

  private toFrame(event: MouseEvent): FramePoint {
    const box = (event.currentTarget as Element).getBoundingClientRect();
    return clientToFrame({ x: event.clientX, y: event.clientY }, box, this.frame());
  }

  protected onClick(event: MouseEvent): void {
    if (this.mode() !== 'corners') return;
    const p = this.toFrame(event);
    this.corners.update((cs) => (cs.length >= 4 ? [p] : [...cs, p]));
  }

  /** Backspace or Delete takes the last corner back; Escape clears them. */
  protected onKey(event: KeyboardEvent): void {
    if (this.mode() !== 'corners') return;
    if (event.key === 'Backspace' || event.key === 'Delete') this.corners.update((cs) => cs.slice(0, -1));
    else if (event.key === 'Escape') this.corners.set([]);
    else return;
    event.preventDefault();
  }

  protected onDown(event: PointerEvent): void {
    if (this.mode() !== 'rectangle') return;
    (event.currentTarget as Element).setPointerCapture?.(event.pointerId);
    const p = this.toFrame(event);
    this.dragFrom.set(p);
    this.dragTo.set(p);
  }

  protected onMove(event: PointerEvent): void {
    if (this.mode() !== 'rectangle' || !this.dragFrom()) return;
    this.dragTo.set(this.toFrame(event));
  }

  protected onUp(event: PointerEvent): void {
    const from = this.dragFrom();
    if (this.mode() !== 'rectangle' || !from) return;
    const to = this.toFrame(event);
    this.dragFrom.set(null);
    this.dragTo.set(null);
    this.region.set(rectangleBetween(from, to, this.frame()));
  }
}
