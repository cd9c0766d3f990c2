import type { Tone } from '@clearbase/contracts';

/** Scene-linear value of the mid grey E_mid maps to: 18 % (common practice of the trade). */
export const MID_GREY = 0.18;

/**
 * Print-like tone curve: log exposure relative to E_mid → display-linear 0..1. Contrast scales log
 * exposure around mid grey; the black point maps to 0, the white point to 1 (both scene-linear).
 * @example toneCurve(0, { contrast: 1, blackPoint: 0, whitePoint: 1 }) // 0.18
 */
export function toneCurve(relativeLogExposure: number, tone: Tone): number {
  const v = toneCurveUnclipped(relativeLogExposure, tone);
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

/**
 * The print tone curve before clipping to 0..1: below the black point negative, above the white point past 1.
 * Smooth, so tables of it interpolate well; clip the result (or the code made from it) afterwards.
 * @example toneCurveUnclipped(0, { contrast: 1, blackPoint: 0, whitePoint: 0.09 }) // 2
 */
export function toneCurveUnclipped(relativeLogExposure: number, tone: Tone): number {
  const y = MID_GREY * 10 ** (tone.contrast * relativeLogExposure);
  return (y - tone.blackPoint) / (tone.whitePoint - tone.blackPoint);
}

/**
 * Reference rendering: log exposure relative to E_mid → scene-linear, 18 % grey stays 18 %, clipped to 0..1.
 * @example referenceTone(Math.log10(0.5 / 0.18)) // 0.5
 */
export function referenceTone(relativeLogExposure: number): number {
  const y = referenceLinear(relativeLogExposure);
  return y > 1 ? 1 : y;
}

/**
 * Reference rendering without clipping: scene-linear MID_GREY · 10^E, so a highlight above white stays above 1.
 * @example referenceLinear(Math.log10(2 / 0.18)) // 2
 */
export function referenceLinear(relativeLogExposure: number): number {
  return MID_GREY * 10 ** relativeLogExposure;
}
