import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { createMonotoneCurve } from '@clearbase/inversion';

/** A point of a characteristic curve: density against log exposure (log10 units both). */
export interface DensityPoint {
  logExposure: number;
  density: number;
}

/** One channel's lines and marks on a density chart. */
export interface DensitySeries {
  channel: 'red' | 'green' | 'blue';
  /** The curve drawn: a monotone cubic through these points when `smooth`, else straight segments between them. */
  curve: readonly DensityPoint[];
  smooth?: boolean;
  /** Points marked with a dot. */
  marks: readonly DensityPoint[];
  /** A straight line drawn dashed, such as a fit over the straight part. */
  fit?: { from: DensityPoint; to: DensityPoint };
}

interface Axis {
  min: number;
  max: number;
  ticks: number[];
}

/** Plot size in SVG units; the chart scales to its container. */
const size = { width: 480, height: 300, left: 48, right: 16, top: 16, bottom: 40 } as const;
/** Samples along each smooth curve: 96 segments look round at 480 units wide (our choice). */
const samples = 96;

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

const coords = (points: readonly { x: number; y: number }[]) =>
  points.length ? `M${points.map((p) => `${p.x.toFixed(1)},${p.y.toFixed(1)}`).join('L')}` : '';

/**
 * Characteristic curves of the three channels, density D against log exposure log H, in one SVG chart: each
 * channel's curve, its marked points and, where given, a dashed straight line. The axes cover every curve and mark,
 * density from zero up.
 */
@Component({
  selector: 'cb-density-chart',
  templateUrl: './density-chart.html',
  styleUrl: './density-chart.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DensityChart {
  readonly series = input.required<readonly DensitySeries[]>();
  /** What the chart shows, for those who cannot see it. */
  readonly label = input.required<string>();
  /** The words under the log exposure axis. */
  readonly exposureLabel = input('log H');
  /** The chart's data-testid. */
  readonly testId = input('density-chart');
  /** Radius of the marks, SVG units. */
  readonly markRadius = input(3);

  protected readonly size = size;
  protected readonly plotRight = size.width - size.right;
  protected readonly plotBottom = size.height - size.bottom;

  private readonly plotted = computed(() => this.series().flatMap((s) => [...s.curve, ...s.marks]));
  protected readonly x = computed(() =>
    axis(
      this.plotted().map((p) => p.logExposure),
      false,
    ),
  );
  protected readonly y = computed(() =>
    axis(
      this.plotted().map((p) => p.density),
      true,
    ),
  );

  protected sx(v: number): number {
    const { min, max } = this.x();
    return size.left + ((v - min) / (max - min)) * (this.plotRight - size.left);
  }

  protected sy(v: number): number {
    const { min, max } = this.y();
    return this.plotBottom - ((v - min) / (max - min)) * (this.plotBottom - size.top);
  }

  private readonly at = (p: DensityPoint) => ({ x: this.sx(p.logExposure), y: this.sy(p.density) });

  protected readonly lines = computed(() =>
    this.series().map((s) => ({
      channel: s.channel,
      path: s.smooth && s.curve.length >= 2 ? this.smoothPath(s.curve) : coords(s.curve.map(this.at)),
      marks: s.marks.map(this.at),
      fit: s.fit && { from: this.at(s.fit.from), to: this.at(s.fit.to) },
    })),
  );

  /** The curve the inversion uses: monotone cubic through the points, straight past the ends, kept inside the plot. */
  private smoothPath(points: readonly DensityPoint[]): string {
    const curve = createMonotoneCurve(
      points.map((p) => p.logExposure),
      points.map((p) => p.density),
    );
    const { min, max } = this.x();
    const { min: dMin, max: dMax } = this.y();
    const drawn: { x: number; y: number }[] = [];
    for (let i = 0; i <= samples; i++) {
      const logExposure = min + ((max - min) * i) / samples;
      const density = curve.evaluate(logExposure);
      if (density >= dMin && density <= dMax) drawn.push(this.at({ logExposure, density }));
    }
    return coords(drawn);
  }
}
