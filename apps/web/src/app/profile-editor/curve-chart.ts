import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { createMonotoneCurve } from '@clearbase/inversion';
import { curvePointProblems, type EditablePoint } from './curve-point-problems';
import { channels, type Channel } from './profile-form';

/** Plot size in SVG units; the chart scales to its container. */
const size = { width: 480, height: 300, left: 48, right: 16, top: 16, bottom: 40 } as const;
/** Samples along each drawn curve. */
const samples = 96;

interface Axis {
  min: number;
  max: number;
  ticks: number[];
}

/** Ticks every 0.5 (log H and D are read in halves by the trade, from memory), or 1 on wide ranges. */
function axis(values: number[], floorAtZero: boolean): Axis {
  let min = Math.min(...values),
    max = Math.max(...values);
  if (!Number.isFinite(min) || !Number.isFinite(max)) [min, max] = [0, 1];
  if (floorAtZero) min = Math.min(0, min);
  if (max - min < 0.5) max = min + 0.5;
  const step = max - min > 4 ? 1 : 0.5;
  const lo = Math.floor(min / step) * step,
    hi = Math.ceil(max / step) * step;
  const ticks: number[] = [];
  for (let t = lo; t <= hi + 1e-9; t += step) ticks.push(Math.round(t * 100) / 100);
  return { min: lo, max: hi, ticks };
}

/** The characteristic curves of the three channels, density against log exposure, in one SVG chart. */
@Component({
  selector: 'cb-curve-chart',
  template: `
    <svg
      [attr.viewBox]="'0 0 ' + size.width + ' ' + size.height"
      role="img"
      [attr.aria-label]="label()"
      data-testid="curve-chart"
    >
      @for (t of x().ticks; track t) {
        <line class="grid" [attr.x1]="sx(t)" [attr.x2]="sx(t)" [attr.y1]="size.top" [attr.y2]="plotBottom" />
        <text class="tick" [attr.x]="sx(t)" [attr.y]="plotBottom + 14" text-anchor="middle">{{ t }}</text>
      }
      @for (t of y().ticks; track t) {
        <line class="grid" [attr.x1]="size.left" [attr.x2]="plotRight" [attr.y1]="sy(t)" [attr.y2]="sy(t)" />
        <text class="tick" [attr.x]="size.left - 6" [attr.y]="sy(t) + 4" text-anchor="end">{{ t }}</text>
      }
      <line
        class="axis"
        [attr.x1]="size.left"
        [attr.x2]="plotRight"
        [attr.y1]="plotBottom"
        [attr.y2]="plotBottom"
      />
      <line
        class="axis"
        [attr.x1]="size.left"
        [attr.x2]="size.left"
        [attr.y1]="size.top"
        [attr.y2]="plotBottom"
      />
      <text
        class="axis-label"
        [attr.x]="(size.left + plotRight) / 2"
        [attr.y]="size.height - 6"
        text-anchor="middle"
      >
        log H
      </text>
      <text class="axis-label" x="14" [attr.y]="(size.top + plotBottom) / 2" text-anchor="middle">D</text>
      @for (line of lines(); track line.channel) {
        <path
          [attr.class]="'curve ' + line.channel"
          [attr.d]="line.path"
          [attr.data-testid]="'curve-' + line.channel"
        />
        @for (p of line.points; track $index) {
          <circle [attr.class]="'point ' + line.channel" [attr.cx]="p.x" [attr.cy]="p.y" r="3" />
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
    .axis {
      stroke: var(--mat-sys-on-surface-variant);
      stroke-width: 1;
    }
    .tick,
    .axis-label {
      fill: var(--mat-sys-on-surface-variant);
      font-size: 11px;
    }
    .axis-label {
      font-size: 13px;
      font-style: italic;
    }
    .curve {
      fill: none;
      stroke-width: 2;
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
    path.red,
    path.green,
    path.blue {
      fill: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CurveChart {
  /** Each channel's control points, as the editor's table holds them. */
  readonly curves = input.required<Record<Channel, readonly EditablePoint[]>>();

  protected readonly size = size;
  protected readonly plotRight = size.width - size.right;
  protected readonly plotBottom = size.height - size.bottom;

  private readonly complete = computed(() => {
    const curves = this.curves();
    return channels.map((channel) => ({
      channel,
      points: curves[channel].filter(
        (p): p is { logExposure: number; density: number } =>
          p.logExposure !== null &&
          p.density !== null &&
          Number.isFinite(p.logExposure) &&
          Number.isFinite(p.density),
      ),
      valid: curvePointProblems(curves[channel]).length === 0,
    }));
  });

  protected readonly x = computed(() =>
    axis(
      this.complete().flatMap((c) => c.points.map((p) => p.logExposure)),
      false,
    ),
  );
  protected readonly y = computed(() =>
    axis(
      this.complete().flatMap((c) => c.points.map((p) => p.density)),
      true,
    ),
  );

  protected readonly label = computed(
    () => `Characteristic curves: density D against log exposure log H, ${channels.join(', ')} channels`,
  );

  protected sx(v: number): number {
    const { min, max } = this.x();
    return size.left + ((v - min) / (max - min)) * (this.plotRight - size.left);
  }

  protected sy(v: number): number {
    const { min, max } = this.y();
    return this.plotBottom - ((v - min) / (max - min)) * (this.plotBottom - size.top);
  }

  protected readonly lines = computed(() =>
    this.complete().map(({ channel, points, valid }) => {
      const marks = points.map((p) => ({ x: this.sx(p.logExposure), y: this.sy(p.density) }));
      let path = '';
      if (valid && points.length >= 2) {
        // the curve the inversion uses: monotone cubic through the points, straight past the ends
        const curve = createMonotoneCurve(
          points.map((p) => p.logExposure),
          points.map((p) => p.density),
        );
        const { min, max } = this.x();
        const coords: string[] = [];
        for (let i = 0; i <= samples; i++) {
          const lx = min + ((max - min) * i) / samples;
          const d = curve.evaluate(lx);
          const { min: dMin, max: dMax } = this.y();
          if (d < dMin || d > dMax) continue;
          coords.push(`${this.sx(lx).toFixed(1)},${this.sy(d).toFixed(1)}`);
        }
        path = coords.length ? `M${coords.join('L')}` : '';
      } else if (marks.length) {
        path = `M${marks.map((m) => `${m.x.toFixed(1)},${m.y.toFixed(1)}`).join('L')}`;
      }
      return { channel, path, points: marks };
    }),
  );
}
