/** Floor on the extrapolation slope past the curve's ends, density per log exposure, so the toe does not explode noise (common practice of the trade, from memory). */
export const MIN_END_SLOPE = 0.2;

/**
 * Knot slopes of the monotone cubic through (xs, ys): Fritsch & Carlson, SIAM J. Numer. Anal.
 * 17(2):238–246, 1980, with the weighted harmonic mean and three-point ends (Fritsch–Butland variant).
 * @example pchipSlopes([0, 1, 2, 3, 4], [0, 1, 1, 2, 5]) // [1.5, 0, 0, 1.5, 4]
 */
export function pchipSlopes(xs: readonly number[], ys: readonly number[]): number[] {
  const n = xs.length;
  if (n < 2 || ys.length !== n) throw new RangeError('need at least two points with matching x and y');
  const h: number[] = [];
  const delta: number[] = [];
  for (let k = 0; k < n - 1; k++) {
    h.push(xs[k + 1]! - xs[k]!);
    if (!(h[k]! > 0)) throw new RangeError('x must increase strictly');
    delta.push((ys[k + 1]! - ys[k]!) / h[k]!);
  }
  if (n === 2) return [delta[0]!, delta[0]!];
  const d = new Array<number>(n).fill(0);
  for (let k = 1; k < n - 1; k++) {
    const a = delta[k - 1]!,
      b = delta[k]!;
    if (a === 0 || b === 0 || Math.sign(a) !== Math.sign(b)) continue;
    const w1 = 2 * h[k]! + h[k - 1]!,
      w2 = h[k]! + 2 * h[k - 1]!;
    d[k] = (w1 + w2) / (w1 / a + w2 / b);
  }
  const end = (h0: number, h1: number, d0: number, d1: number) => {
    const s = ((2 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
    if (Math.sign(s) !== Math.sign(d0)) return 0;
    if (Math.sign(d0) !== Math.sign(d1) && Math.abs(s) > 3 * Math.abs(d0)) return 3 * d0;
    return s;
  };
  d[0] = end(h[0]!, h[1]!, delta[0]!, delta[1]!);
  d[n - 1] = end(h[n - 2]!, h[n - 3]!, delta[n - 2]!, delta[n - 3]!);
  return d;
}

/** A monotone curve y = f(x) through control points, with its inverse. */
export interface MonotoneCurve {
  /** y at x; past the ends, straight lines of the end slopes (floored at `minEndSlope`). */
  evaluate(x: number): number;
  /** x at y, the inverse of `evaluate` (curve must increase). */
  inverse(y: number): number;
}

/**
 * Monotone cubic (PCHIP) through increasing control points, with end-slope extrapolation.
 * @example createMonotoneCurve([0, 1, 2, 3, 4], [0, 1, 1, 2, 5]).evaluate(3.5) // 3.1875
 */
export function createMonotoneCurve(
  xs: readonly number[],
  ys: readonly number[],
  minEndSlope = MIN_END_SLOPE,
): MonotoneCurve {
  const d = pchipSlopes(xs, ys);
  const n = xs.length;
  const x0 = xs[0]!,
    xn = xs[n - 1]!,
    y0 = ys[0]!,
    yn = ys[n - 1]!;
  const s0 = Math.max(d[0]!, minEndSlope),
    sn = Math.max(d[n - 1]!, minEndSlope);
  const evaluate = (x: number): number => {
    if (x <= x0) return y0 + s0 * (x - x0);
    if (x >= xn) return yn + sn * (x - xn);
    let lo = 0,
      hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (xs[mid]! <= x) lo = mid;
      else hi = mid;
    }
    const h = xs[hi]! - xs[lo]!;
    const t = (x - xs[lo]!) / h;
    const t2 = t * t,
      t3 = t2 * t;
    return (
      (2 * t3 - 3 * t2 + 1) * ys[lo]! +
      (t3 - 2 * t2 + t) * h * d[lo]! +
      (-2 * t3 + 3 * t2) * ys[hi]! +
      (t3 - t2) * h * d[hi]!
    );
  };
  const slope = (x: number, lo: number, hi: number): number => {
    const h = xs[hi]! - xs[lo]!;
    const t = (x - xs[lo]!) / h;
    const t2 = t * t;
    return (
      ((6 * t2 - 6 * t) * (ys[lo]! - ys[hi]!)) / h + (3 * t2 - 4 * t + 1) * d[lo]! + (3 * t2 - 2 * t) * d[hi]!
    );
  };
  const inverse = (y: number): number => {
    if (y <= y0) return x0 + (y - y0) / s0;
    if (y >= yn) return xn + (y - yn) / sn;
    let lo = 0,
      hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (ys[mid]! <= y) lo = mid;
      else hi = mid;
    }
    // Newton's method kept inside a shrinking bracket (a bisection step whenever Newton would leave it):
    // quadratic convergence on the smooth segment, never worse than bisection; 1e-13 is double precision here.
    let a = xs[lo]!,
      b = xs[hi]!;
    const ya = ys[lo]!,
      yb = ys[hi]!;
    let x = yb > ya ? a + ((y - ya) / (yb - ya)) * (b - a) : 0.5 * (a + b);
    for (let i = 0; i < 100 && b - a > 1e-13; i++) {
      const f = evaluate(x) - y;
      if (f === 0) return x;
      if (f < 0) a = x;
      else b = x;
      const g = slope(x, lo, hi);
      const next = g > 0 ? x - f / g : NaN;
      if (!(next > a && next < b)) x = 0.5 * (a + b);
      else if (Math.abs(next - x) < 1e-14) return next;
      else x = next;
    }
    return x;
  };
  return { evaluate, inverse };
}
