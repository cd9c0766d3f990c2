import type { Tone } from '@clearbase/contracts';

/** Scene-linear value of the mid grey E_mid maps to: 18 % (common practice of the trade). */
export const MID_GREY = 0.18;

/**
 * Print-like tone curve: log exposure relative to E_mid → display-linear 0..1. Contrast scales log
 * exposure around mid grey; the black point maps to 0, the white point to 1 (both scene-linear).
 * @example toneCurve(0, { contrast: 1, blackPoint: 0, whitePoint: 1 }) // 0.18
 */
export function toneCurve(relativeLogExposure: number, tone: Tone): number {
  const y = MID_GREY * 10 ** (tone.contrast * relativeLogExposure);
  const v = (y - tone.blackPoint) / (tone.whitePoint - tone.blackPoint);
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

/**
 * Reference rendering: log exposure relative to E_mid → scene-linear, 18 % grey stays 18 %, clipped to 0..1.
 * @example referenceTone(Math.log10(0.5 / 0.18)) // 0.5
 */
export function referenceTone(relativeLogExposure: number): number {
  const y = MID_GREY * 10 ** relativeLogExposure;
  return y > 1 ? 1 : y;
}
