import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { CalibrationFit } from '@clearbase/contracts';

/** Plot size in SVG units; the chart scales to its container (the profile editor's proportions). */
const size = { width: 480, height: 300, left: 48, right: 16, top: 16, bottom: 40 } as const;
const channels = ['red', 'green', 'blue'] as const;

/** Ticks every 0.5 over the range, as log H and D are read in halves by the trade (from memory). */
function ticks(min: number, max: number): number[] {
  const out: number[] = [];
  for (let t = Math.floor(min * 2) / 2; t <= max + 1e-9; t += 0.5) out.push(Math.round(t * 10) / 10);
  return out;
}

/**
 * A calibration's three characteristic curves: each channel's fitted curve (through its control points), the
 * least-squares straight line over its straight part (dashed, a little beyond it) and the grey frames as dots.
 * The profile editor's chart draws editable points only, so this plot is its own.
 */
@Component({
  selector: 'cb-characteristic-plot',
  template: `
    <svg
      [attr.viewBox]="'0 0 ' + size.width + ' ' + size.height"
      role="img"
      aria-label="Characteristic curves: density against log exposure, red, green and blue, with fitted straight lines"
      data-testid="characteristic-plot"
    >
      @for (t of xTicks(); track t) {
        <line class="grid" [attr.x1]="sx(t)" [attr.x2]="sx(t)" [attr.y1]="size.top" [attr.y2]="bottom" />
        <text class="tick" [attr.x]="sx(t)" [attr.y]="bottom + 14" text-anchor="middle">{{ t }}</text>
      }
      @for (t of yTicks(); track t) {
        <line class="grid" [attr.x1]="size.left" [attr.x2]="right" [attr.y1]="sy(t)" [attr.y2]="sy(t)" />
        <text class="tick" [attr.x]="size.left - 6" [attr.y]="sy(t) + 4" text-anchor="end">{{ t }}</text>
      }
      <text
        class="axis-label"
        [attr.x]="(size.left + right) / 2"
        [attr.y]="size.height - 6"
        text-anchor="middle"
      >
        log H (0 = metered grey)
      </text>
      <text class="axis-label" x="14" [attr.y]="(size.top + bottom) / 2" text-anchor="middle">D</text>
      @for (l of lines(); track l.channel) {
        <path
          [attr.class]="'curve ' + l.channel"
          [attr.d]="l.curve"
          [attr.data-testid]="'curve-' + l.channel"
        />
        <line
          [attr.class]="'fit ' + l.channel"
          [attr.x1]="l.fit.x1"
          [attr.y1]="l.fit.y1"
          [attr.x2]="l.fit.x2"
          [attr.y2]="l.fit.y2"
          [attr.data-testid]="'fit-' + l.channel"
        />
        @for (p of l.dots; track $index) {
          <circle [attr.class]="'dot ' + l.channel" [attr.cx]="p.x" [attr.cy]="p.y" r="2.5" />
        }
      }
    </svg>
  `,
  styles: `
    :host {
      display: block;
    }
    svg {
      width: 100%;
      height: auto;
      display: block;
    }
    .grid {
      stroke: var(--mat-sys-outline-variant);
      stroke-width: 0.5;
    }
    .tick,
    .axis-label {
      fill: var(--mat-sys-on-surface-variant);
      font-size: 11px;
    }
    .curve {
      fill: none;
      stroke-width: 2;
    }
    .fit {
      stroke-width: 1.2;
      stroke-dasharray: 5 3;
    }
    .red {
      stroke: #c62828;
      fill: #c62828;
    }
    .green {
      stroke: #2e7d32;
      fill: #2e7d32;
    }
    .blue {
      stroke: #1565c0;
      fill: #1565c0;
    }
    path.curve {
      fill: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CharacteristicPlot {
  readonly fit = input.required<Pick<CalibrationFit, 'curves' | 'greyPoints'>>();

  protected readonly size = size;
  protected readonly right = size.width - size.right;
  protected readonly bottom = size.height - size.bottom;

  private readonly range = computed(() => {
    const f = this.fit();
    const xs = [
      ...channels.flatMap((c) => f.curves[c].points.map((p) => p.logExposure)),
      ...f.greyPoints.map((p) => p.logExposure),
    ];
    const ds = [
      ...channels.flatMap((c) => f.curves[c].points.map((p) => p.density)),
      ...f.greyPoints.flatMap((p) => p.densities),
    ];
    const x0 = Math.floor(Math.min(...xs) * 2) / 2,
      x1 = Math.ceil(Math.max(...xs) * 2) / 2;
    return { x0, x1: x1 > x0 ? x1 : x0 + 0.5, d1: Math.ceil(Math.max(0.5, ...ds) * 2) / 2 };
  });
  protected readonly xTicks = computed(() => ticks(this.range().x0, this.range().x1));
  protected readonly yTicks = computed(() => ticks(0, this.range().d1));

  protected sx(v: number): number {
    const { x0, x1 } = this.range();
    return size.left + ((v - x0) / (x1 - x0)) * (this.right - size.left);
  }

  protected sy(v: number): number {
    return this.bottom - (Math.max(0, v) / this.range().d1) * (this.bottom - size.top);
  }

  protected readonly lines = computed(() => {
    const f = this.fit();
    return channels.map((channel, c) => {
      const curve = f.curves[channel];
      const { from, to, intercept } = curve.straightPart;
      const pad = 0.15 * (to - from);
      const at = (x: number) => intercept + curve.gamma * x;
      return {
        channel,
        curve: `M${curve.points.map((p) => `${this.sx(p.logExposure).toFixed(1)},${this.sy(p.density).toFixed(1)}`).join('L')}`,
        fit: {
          x1: this.sx(from - pad),
          y1: this.sy(at(from - pad)),
          x2: this.sx(to + pad),
          y2: this.sy(at(to + pad)),
        },
        dots: f.greyPoints.map((p) => ({ x: this.sx(p.logExposure), y: this.sy(p.densities[c]!) })),
      };
    });
  });
}
