import type { MonotoneCurve } from '../monotone-curve';
import { LOG_EXPOSURE_PER_STOP } from '../printer-points';
import type { Rgb } from '../srgb';

/** Density above minimum density at each layer's speed point (ISO 5800:1987, colour negative film speed). */
export const SPEED_POINT_DENSITY = 0.15;

/**
 * Log exposure of the speed point below the metered grey for a film exposed at its box speed: the speed
 * point is H_M = √2 / S (ISO 5800) and a reflected-light meter calibrated with K = 12.5 through a camera
 * with q = 0.65 (ISO 2720 constants) gives the metered grey H = q·K / S, so log10(H / H_M) =
 * log10(0.65 × 12.5 / √2) = 0.759 (about 2.5 stops). Formula and constants from memory, unverified.
 */
export const NOMINAL_SPEED_POINT_DEPTH = Math.log10((0.65 * 12.5) / Math.SQRT2);

/** The speed point of a calibration and the exposure index it implies. */
export interface SpeedPoint {
  /** Per channel, relative log exposure (0 = metered grey) where density is 0.15 above base. */
  channels: Rgb;
  /** Per channel: true when the point lies below the lowest measured density (found by extrapolation). */
  extrapolated: [boolean, boolean, boolean];
  /** Which of red (0) and blue (2) is the slower layer, H_S in ISO 5800. */
  slowerLayer: 0 | 2;
  /** Combined speed point log H_M = (log H_G + log H_S) / 2, relative log exposure. */
  logExposure: number;
  /** (log H_M + NOMINAL_SPEED_POINT_DEPTH) / log10 2: stops more exposure than a film at box speed needs. */
  offsetStops: number;
  /** Exposure index: box ISO × 2^(−offsetStops). */
  ei: number;
}

/**
 * The speed point of a colour negative film from its measured (not crosstalk-corrected) curves, as
 * ISO 5800 combines the layers: each layer's point where density is 0.15 above its minimum (here: above the
 * sampled base, which includes fog), H_S the slower (larger exposure) of red and blue, and
 * H_M = √(H_G · H_S), i.e. log H_M = (log H_G + log H_S) / 2. Relative to the metered exposure the
 * offset in stops is (log H_M + 0.759) / log10 2 and EI = ISO × 2^(−offset).
 *
 * Worked arithmetic: green at −1.20, red −1.10, blue −1.15 → H_S red, log H_M = −1.15;
 * offset = (−1.15 + 0.7593) / 0.30103 = −1.298 stops; an ISO 200 film rates at EI 200 × 2^1.298 = 492.
 * @example speedPoint([red, green, blue], 200).ei // e.g. 492
 */
export function speedPoint(
  curves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve],
  iso: number,
  lowest?: Rgb,
): SpeedPoint {
  if (!(typeof iso === 'number' && iso > 0 && Number.isFinite(iso)))
    throw new RangeError(`Expected number above 0 for iso but received ${iso} of type ${typeof iso}`);
  const channels = curves.map((c) => c.inverse(SPEED_POINT_DENSITY)) as Rgb;
  const extrapolated = [0, 1, 2].map((c) => (lowest ? SPEED_POINT_DENSITY < lowest[c]! : false)) as [
    boolean,
    boolean,
    boolean,
  ];
  const slowerLayer = channels[0] >= channels[2] ? 0 : 2;
  const logExposure = (channels[1] + channels[slowerLayer]) / 2;
  const offsetStops = (logExposure + NOMINAL_SPEED_POINT_DEPTH) / LOG_EXPOSURE_PER_STOP;
  return { channels, extrapolated, slowerLayer, logExposure, offsetStops, ei: iso * 2 ** -offsetStops };
}
