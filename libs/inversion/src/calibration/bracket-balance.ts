import type { Balance } from '@clearbase/contracts';
import { neutralBalance } from '../frame-levels';
import { LUMINANCE_WEIGHTS } from '../invert-pixel';
import type { MonotoneCurve } from '../monotone-curve';
import type { Rgb } from '../srgb';

/** One grey frame's neutral balance. */
export interface BracketFrameBalance {
  /** The frame's exposure, stops from the metered exposure. */
  stops: number;
  /** Printer points that make this grey neutral when all three channels are read through the reference curve. */
  balance: Balance;
}

/** Neutral balance across a grey bracket and how far one balance fits all of it. */
export interface BracketBalance {
  frames: BracketFrameBalance[];
  /** Mean balance over the bracket, points. */
  mean: Balance;
  /** Largest minus smallest balance per axis, points. */
  range: Balance;
  /** Standard deviation per axis (of the population of frames), points. */
  standardDeviation: Balance;
  /** The largest of the three ranges, points: how much a single balance misses somewhere in the bracket. */
  largestRange: number;
}

/**
 * The neutral balance of each grey frame of a bracket, in printer points on the three axes, and its spread.
 * Each frame's densities (after crosstalk) are read through one reference curve — the green channel's,
 * the layer ISO 5800 also takes as reference — so the points are what an optical printer with a single
 * curve would need per exposure. Parallel channel curves give the same balance at every exposure (no
 * spread); curves of different γ cross, and the balance drifts along the bracket (the spread).
 * The profile itself keeps a curve per channel, which makes every grey neutral; the spread says how
 * different those curves are.
 * @example bracketBalance([{ stops: 0, densities: [0.7, 0.72, 0.75] }], greenCurve).frames[0].balance // { cyanRed: 1.3, magentaGreen: 0.5, yellowBlue: -1.8 }
 */
export function bracketBalance(
  frames: readonly { stops: number; densities: Rgb }[],
  referenceCurve: MonotoneCurve,
): BracketBalance {
  if (!frames.length) throw new RangeError('Expected at least 1 grey frame but received 0');
  const out = frames.map((f) => {
    const e = f.densities.map((d) => referenceCurve.inverse(d)) as Rgb;
    const mid = LUMINANCE_WEIGHTS[0] * e[0] + LUMINANCE_WEIGHTS[1] * e[1] + LUMINANCE_WEIGHTS[2] * e[2];
    return {
      stops: f.stops,
      balance: neutralBalance({
        midLogExposure: mid,
        channelMeans: e,
        blackLogExposure: mid,
        whiteLogExposure: mid,
      }),
    };
  });
  const axes = ['cyanRed', 'magentaGreen', 'yellowBlue'] as const;
  const stat = (f: (v: number[]) => number): Balance =>
    Object.fromEntries(axes.map((a) => [a, f(out.map((o) => o.balance[a]))])) as Balance;
  const mean = stat((v) => v.reduce((s, x) => s + x, 0) / v.length);
  const range = stat((v) => Math.max(...v) - Math.min(...v));
  const standardDeviation = stat((v) => {
    const m = v.reduce((s, x) => s + x, 0) / v.length;
    return Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / v.length);
  });
  return {
    frames: out,
    mean,
    range,
    standardDeviation,
    largestRange: Math.max(range.cyanRed, range.magentaGreen, range.yellowBlue),
  };
}
