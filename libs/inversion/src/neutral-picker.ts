import type { Balance } from '@clearbase/contracts';
import type { Region, RgbImage } from './film-base';
import { pixelDensities, resolveInversion, LUMINANCE_WEIGHTS, type InversionParams } from './invert-pixel';
import { LOG_EXPOSURE_PER_POINT } from './printer-points';
import type { Rgb } from './srgb';

/** Samples read from a picked area at most; a strided subset beyond (a mean of 40 000 is steady to 1e-3 point). */
const MAX_PICK_SAMPLES = 40_000;

/** What the neutral picker found in an area that should be grey. */
export interface NeutralPick {
  /** Printer points to add to the current balance so the area renders neutral (fractional). */
  correction: Balance;
  /** The same rounded to whole points, as the controls step. */
  wholePoints: Balance;
  /** Mean log exposure per channel relative to E_mid, after the current balance, before the correction. */
  meanLogExposure: Rgb;
  /** Pixels averaged. */
  samples: number;
}

/**
 * The balance that makes an area neutral: each pixel of `region` goes back to log exposure through the profile's
 * curves with the current balance and exposure of `params` (before saturation, which keeps neutrals neutral); each
 * channel's mean is moved onto the luminance-weighted mean of the three, so the area turns grey at the brightness
 * it had. One printer point is `LOG_EXPOSURE_PER_POINT` log exposure.
 * @example pickNeutral(negative, [120, 80, 16, 16], params).wholePoints // { cyanRed: 1, magentaGreen: 6, yellowBlue: -2 }
 */
export function pickNeutral(image: RgbImage, region: Region, params: InversionParams): NeutralPick {
  const x0 = Math.max(0, Math.floor(region[0]));
  const y0 = Math.max(0, Math.floor(region[1]));
  const x1 = Math.min(image.width, Math.ceil(region[0] + region[2]));
  const y1 = Math.min(image.height, Math.ceil(region[1] + region[3]));
  if (x1 <= x0 || y1 <= y0)
    throw new RangeError(`Expected an area inside the ${image.width}×${image.height} negative`);
  const resolved = resolveInversion(params);
  const step = Math.max(1, Math.ceil(Math.sqrt(((x1 - x0) * (y1 - y0)) / MAX_PICK_SAMPLES)));
  const sum = [0, 0, 0];
  let samples = 0;
  for (let y = y0; y < y1; y += step)
    for (let x = x0; x < x1; x += step) {
      const i = (y * image.width + x) * 3;
      const counts: Rgb = [image.data[i]!, image.data[i + 1]!, image.data[i + 2]!];
      const d = pixelDensities(params, resolved.crosstalk, counts);
      for (let c = 0; c < 3; c++) sum[c]! += resolved.curves[c]!.inverse(d[c]!) + resolved.offset[c]!;
      samples++;
    }
  const mean: Rgb = [sum[0]! / samples, sum[1]! / samples, sum[2]! / samples];
  const grey =
    LUMINANCE_WEIGHTS[0] * mean[0] + LUMINANCE_WEIGHTS[1] * mean[1] + LUMINANCE_WEIGHTS[2] * mean[2];
  const points = (c: 0 | 1 | 2) => (grey - mean[c]) / LOG_EXPOSURE_PER_POINT;
  const correction: Balance = { cyanRed: points(0), magentaGreen: points(1), yellowBlue: points(2) };
  const whole = (v: number) => Math.round(v) + 0;
  return {
    correction,
    wholePoints: {
      cyanRed: whole(correction.cyanRed),
      magentaGreen: whole(correction.magentaGreen),
      yellowBlue: whole(correction.yellowBlue),
    },
    meanLogExposure: mean,
    samples,
  };
}
