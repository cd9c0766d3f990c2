import type { CurvePoint } from '@clearbase/contracts';
import { createMonotoneCurve, type MonotoneCurve } from '../monotone-curve';
import { isotonicRegression } from './isotonic-regression';

/** A point of a curve: log exposure and density above base. */
export interface CurvePosition {
  logExposure: number;
  density: number;
}

/** A fitted characteristic curve of one channel. */
export interface CharacteristicCurveFit {
  /** Monotone control points (both coordinates strictly increasing), for the profile and for plots. */
  points: CurvePoint[];
  /** The curve through `points` (PCHIP, end-slope extrapolation). */
  curve: MonotoneCurve;
  /** True when the measured series went down somewhere and was made monotone by isotonic regression. */
  adjusted: boolean;
  /** RMS of measured density − fitted density at the measured points, D (0 when nothing was adjusted). */
  residualRms: number;
  /** γ: slope of the least-squares line over the straight part, density per log exposure. */
  gamma: number;
  /** The straight part: first and last log exposure, the line's density at log exposure 0, its RMS residual (D) and point count. */
  straightPart: { from: number; to: number; intercept: number; residualRms: number; points: number };
  /** Where the straight part begins when the curve bends below it within the measured range; null when it runs to the lowest point. */
  toe: CurvePosition | null;
  /** Where the straight part ends when the curve bends above it within the measured range; null when it runs to the highest point. */
  shoulder: CurvePosition | null;
}

/** Options of `fitCharacteristicCurve`. */
export interface CurveFitOptions {
  /** Local slopes within this fraction of the reference slope count as straight. Default STRAIGHT_TOLERANCE. */
  tolerance?: number;
}

/**
 * Local slopes within ±10 % of the steepest sustained slope count as the straight part. Chosen, not standard:
 * a toe or shoulder at 10 % below the straight-line gradient bends the line by under 1 % of γ, while
 * interval slopes of a third-stop bracket scatter by a few per cent with grain (measured on the forward model).
 */
export const STRAIGHT_TOLERANCE = 0.1;
/** Consecutive intervals averaged to find the steepest sustained slope (chosen: 3 intervals = one stop at third stops). */
const REFERENCE_WINDOW = 3;

/**
 * Fits one channel's characteristic curve from measured (log exposure, density above base) points.
 *
 * Points are sorted by log exposure and points at the same exposure averaged. When the densities do not
 * rise strictly (noise or a shuffled series) they are made non-decreasing by isotonic regression and runs
 * of equal density pooled into one point, and `adjusted` is set. The control points then carry a
 * monotone cubic (PCHIP).
 *
 * **Straight part**: the steepest sustained slope is the largest slope over any 3 consecutive intervals
 * (fewer when there are fewer); the straight part is the longest run of consecutive intervals around that
 * window whose own slopes stay within ±`tolerance` (default 10 %) of it — on a characteristic curve
 * the gradient is greatest on the straight line and falls off in toe and shoulder. γ is the slope of the
 * least-squares line through the points of that run. The toe and shoulder are reported where the run stops
 * inside the measured range.
 *
 * Throws a RangeError with fewer than two distinct exposures, non-finite values, or a series with no rise.
 * @example fitCharacteristicCurve([{ logExposure: -0.3, density: 0.52 }, { logExposure: 0, density: 0.7 }, { logExposure: 0.3, density: 0.88 }]).gamma // 0.6
 */
export function fitCharacteristicCurve(
  measured: readonly CurvePosition[],
  options: CurveFitOptions = {},
): CharacteristicCurveFit {
  const tolerance = options.tolerance ?? STRAIGHT_TOLERANCE;
  measured.forEach((p, i) => {
    if (!Number.isFinite(p.logExposure) || !Number.isFinite(p.density))
      throw new RangeError(
        `Expected finite log exposure and density for point ${i} but received ${p.logExposure}, ${p.density}`,
      );
  });
  // Sort, then average points at the same exposure.
  const sorted = [...measured].sort((a, b) => a.logExposure - b.logExposure);
  const xs: number[] = [],
    ys: number[] = [],
    ws: number[] = [];
  for (const p of sorted) {
    const last = xs.length - 1;
    if (last >= 0 && Math.abs(p.logExposure - xs[last]!) < 1e-9) {
      ys[last] = (ys[last]! * ws[last]! + p.density) / (ws[last]! + 1);
      ws[last]!++;
    } else {
      xs.push(p.logExposure);
      ys.push(p.density);
      ws.push(1);
    }
  }
  if (xs.length < 2)
    throw new RangeError(`Expected at least 2 distinct log exposures but received ${xs.length}`);
  const rising = ys.every((y, i) => i === 0 || y > ys[i - 1]!);
  const fitted = rising ? ys : isotonicRegression(ys, ws);
  // Pool runs of equal density (what isotonic regression leaves) into one point each.
  const px: number[] = [],
    py: number[] = [];
  for (let i = 0; i < xs.length;) {
    let j = i,
      sx = 0,
      sw = 0;
    while (j < xs.length && fitted[j] === fitted[i]) {
      sx += xs[j]! * ws[j]!;
      sw += ws[j]!;
      j++;
    }
    px.push(sx / sw);
    py.push(fitted[i]!);
    i = j;
  }
  if (px.length < 2)
    throw new RangeError('Expected densities that rise with exposure but received a series with no rise');
  const curve = createMonotoneCurve(px, py);
  let sq = 0;
  for (const p of measured) sq += (p.density - curve.evaluate(p.logExposure)) ** 2;
  const residualRms = rising ? 0 : Math.sqrt(sq / measured.length);

  const n = px.length;
  const slope = (i: number) => (py[i + 1]! - py[i]!) / (px[i + 1]! - px[i]!);
  const window = Math.min(REFERENCE_WINDOW, n - 1);
  let best = 0,
    reference = -Infinity;
  for (let i = 0; i + window <= n - 1; i++) {
    const s = (py[i + window]! - py[i]!) / (px[i + window]! - px[i]!);
    if (s > reference) {
      reference = s;
      best = i;
    }
  }
  const straight = (i: number) => Math.abs(slope(i) - reference) <= tolerance * reference;
  let first = best,
    last = best + window - 1;
  while (first > 0 && straight(first - 1)) first--;
  while (last < n - 2 && straight(last + 1)) last++;
  const line = leastSquaresLine(px.slice(first, last + 2), py.slice(first, last + 2));
  return {
    points: px.map((x, i) => ({ logExposure: x, density: py[i]! })),
    curve,
    adjusted: !rising,
    residualRms,
    gamma: line.slope,
    straightPart: {
      from: px[first]!,
      to: px[last + 1]!,
      intercept: line.intercept,
      residualRms: line.residualRms,
      points: last - first + 2,
    },
    toe: first > 0 ? { logExposure: px[first]!, density: py[first]! } : null,
    shoulder: last + 1 < n - 1 ? { logExposure: px[last + 1]!, density: py[last + 1]! } : null,
  };
}

/**
 * Least-squares straight line y = intercept + slope·x and its RMS residual.
 * @example leastSquaresLine([0, 1, 2], [1, 3, 5]) // { slope: 2, intercept: 1, residualRms: 0 }
 */
export function leastSquaresLine(
  xs: readonly number[],
  ys: readonly number[],
): { slope: number; intercept: number; residualRms: number } {
  const n = xs.length;
  if (n < 2 || ys.length !== n) throw new RangeError(`Expected at least 2 matching points but received ${n}`);
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0,
    sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  if (!(sxx > 0)) throw new RangeError('Expected points at more than one x but received all at the same x');
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let sq = 0;
  for (let i = 0; i < n; i++) sq += (ys[i]! - intercept - slope * xs[i]!) ** 2;
  return { slope, intercept, residualRms: Math.sqrt(sq / n) };
}
