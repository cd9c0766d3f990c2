import type { Balance, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import { capturePrimariesToSrgb } from './capture-primaries';
import { densityAboveBase } from './density';
import { createMonotoneCurve, type MonotoneCurve } from './monotone-curve';
import { addBalances, balanceToLogExposure, stopsToLogExposure } from './printer-points';
import { linearise, FULL_SCALE_16 } from './scanner-input';
import { srgbEncode, type Matrix3, type Rgb } from './srgb';
import { MID_GREY, referenceLinear, referenceTone, toneCurve, toneCurveUnclipped } from './tone-curve';

/** Densities above base are held to this range, D (covers any colour negative, from memory). */
export const DENSITY_RANGE: readonly [number, number] = [-0.5, 4.5];
/** Log exposures relative to E_mid are held to this range (below 16-bit black, above any white point). */
export const RELATIVE_LOG_EXPOSURE_RANGE: readonly [number, number] = [-6, 3];
/** Weights for the neutral axis in saturation: Rec. 709 / sRGB luminance (IEC 61966-2-1 matrix, row Y). */
export const LUMINANCE_WEIGHTS: Rgb = [0.2126, 0.7152, 0.0722];

/**
 * The parts of a stock profile the inversion uses. `exposureMatrix`, when present, is the change of primaries and
 * `capturePrimaries` is not used; absent, everything renders as before.
 */
export type InversionProfile = Pick<
  ProfileDocument,
  'curves' | 'crosstalk' | 'balance' | 'tone' | 'saturation' | 'capturePrimaries' | 'exposureMatrix'
>;

/**
 * Everything that determines how one frame inverts.
 * @example { profile, scanner: LINEAR_SCANNER, base: [0.8, 0.78, 0.75], midLogExposure: -0.7, render: 'reference', outputBits: 8 }
 */
export interface InversionParams {
  profile: InversionProfile;
  scanner: ScannerProfile;
  /** Film base B_c as linear light, 0..1 of full scale. */
  base: Rgb;
  /** Roll and frame balance in printer points, added to the profile's (see `balanceToLogExposure` for signs). */
  balances?: Balance[];
  /** Extra exposure in stops; + makes the positive lighter. */
  exposureStops?: number;
  /** E_mid, log10 exposure rendered as 18 % grey (before balance and exposure). */
  midLogExposure: number;
  /** 'print': tone curve and saturation; 'reference': scene-linear straight to sRGB, saturation 1. */
  render: 'print' | 'reference';
  outputBits: 8 | 16;
}

/** The per-channel pieces of an inversion, resolved once. */
export interface ResolvedInversion {
  curves: [MonotoneCurve, MonotoneCurve, MonotoneCurve];
  crosstalk: Matrix3;
  /** Added to the recovered log exposure per channel: balance + exposure − E_mid. */
  offset: Rgb;
  /**
   * Film's capture primaries → linear sRGB, applied to the recovered exposures (in linear light) before saturation
   * and tone: the profile's exposure-space matrix, else its named capture primaries; null when the film records in
   * sRGB primaries (the profile says nothing, or 'srgb').
   */
  primaries: Matrix3 | null;
  saturation: number;
  /** Relative log exposure → output code value (not rounded), clipped to 0…maxCode. */
  encode: (relativeLogExposure: number) => number;
  /**
   * The same before clipping (smooth past black and white): tables of it interpolate without kinks; clipping the
   * interpolated code to 0…maxCode gives `encode` (both curves are increasing, and sRGB keeps 0 and 1).
   */
  encodeUnclipped: (relativeLogExposure: number) => number;
  maxCode: number;
}

const clamp = (x: number, lo: number, hi: number) => (x < lo ? lo : x > hi ? hi : x);

function describe(value: unknown): string {
  return `${typeof value === 'number' ? value : JSON.stringify(value)} of type ${typeof value}`;
}

/**
 * Checks params before any work; throws a RangeError of one shape, e.g.
 * `Expected number above 0 and at most 1 for base[1] but received 0 of type number`.
 * @example assertInversionParams({ ...params, outputBits: 12 }) // throws "Expected 8 or 16 for outputBits but received 12 of type number"
 */
export function assertInversionParams(params: InversionParams): void {
  params.base.forEach((b, c) => {
    if (!(typeof b === 'number' && b > 0 && b <= 1))
      throw new RangeError(
        `Expected number above 0 and at most 1 for base[${c}] but received ${describe(b)}`,
      );
  });
  if (params.outputBits !== 8 && params.outputBits !== 16)
    throw new RangeError(`Expected 8 or 16 for outputBits but received ${describe(params.outputBits)}`);
  if (params.render !== 'print' && params.render !== 'reference')
    throw new RangeError(
      `Expected 'print' or 'reference' for render but received ${describe(params.render)}`,
    );
  if (!Number.isFinite(params.midLogExposure))
    throw new RangeError(
      `Expected finite number for midLogExposure but received ${describe(params.midLogExposure)}`,
    );
  if (params.exposureStops !== undefined && !Number.isFinite(params.exposureStops))
    throw new RangeError(
      `Expected finite number for exposureStops but received ${describe(params.exposureStops)}`,
    );
}

/**
 * Resolves params into curves, offsets and the output encoding. Throws a RangeError on invalid params.
 * @example resolveInversion(params).offset // [balance_r + exposure − E_mid, …]
 */
export function resolveInversion(params: InversionParams): ResolvedInversion {
  assertInversionParams(params);
  const { profile } = params;
  const curve = (c: 'red' | 'green' | 'blue') =>
    createMonotoneCurve(
      profile.curves[c].points.map((p) => p.logExposure),
      profile.curves[c].points.map((p) => p.density),
    );
  const balance = balanceToLogExposure(addBalances(profile.balance, ...(params.balances ?? [])));
  const shift = stopsToLogExposure(params.exposureStops ?? 0) - params.midLogExposure;
  const maxCode = params.outputBits === 8 ? 255 : FULL_SCALE_16;
  const tone = profile.tone;
  const encode =
    params.render === 'reference'
      ? (rel: number) => maxCode * srgbEncode(referenceTone(rel))
      : (rel: number) => maxCode * srgbEncode(toneCurve(rel, tone));
  const encodeUnclipped =
    params.render === 'reference'
      ? (rel: number) => maxCode * srgbEncode(referenceLinear(rel))
      : (rel: number) => maxCode * srgbEncode(toneCurveUnclipped(rel, tone));
  return {
    curves: [curve('red'), curve('green'), curve('blue')],
    crosstalk: profile.crosstalk,
    offset: [balance[0] + shift, balance[1] + shift, balance[2] + shift],
    primaries: profile.exposureMatrix ?? capturePrimariesToSrgb(profile.capturePrimaries),
    saturation: params.render === 'reference' ? 1 : profile.saturation,
    encode,
    encodeUnclipped,
    maxCode,
  };
}

/**
 * Densities above base after crosstalk, D' = M·D, of one pixel of 16-bit counts, held to DENSITY_RANGE.
 * @example pixelDensities(params, [6554, 6554, 6554]) // ≈ [1, 1, 1] for base 1 and identity crosstalk
 */
export function pixelDensities(
  params: Pick<InversionParams, 'scanner' | 'base'>,
  crosstalk: Matrix3,
  counts: Rgb,
): Rgb {
  const d = [0, 1, 2].map((c) =>
    densityAboveBase(linearise(counts[c]! / FULL_SCALE_16, params.scanner, c as 0 | 1 | 2), params.base[c]!),
  );
  const [lo, hi] = DENSITY_RANGE;
  const dd = [clamp(d[0]!, lo, hi), clamp(d[1]!, lo, hi), clamp(d[2]!, lo, hi)];
  return [0, 1, 2].map((r) =>
    clamp(crosstalk[r]![0] * dd[0]! + crosstalk[r]![1] * dd[1]! + crosstalk[r]![2] * dd[2]!, lo, hi),
  ) as Rgb;
}

/**
 * Log exposure relative to E_mid per channel as the film recorded it, in its capture primaries (after balance and
 * exposure; before the change of primaries and saturation) of one pixel, held to the relative range.
 * @example filmLogExposure(resolveInversion(params), params, [30000, 30000, 30000])
 */
export function filmLogExposure(resolved: ResolvedInversion, params: InversionParams, counts: Rgb): Rgb {
  const dp = pixelDensities(params, resolved.crosstalk, counts);
  const [lo, hi] = RELATIVE_LOG_EXPOSURE_RANGE;
  return [0, 1, 2].map((c) =>
    clamp(resolved.curves[c]!.inverse(dp[c]!) + resolved.offset[c]!, lo, hi),
  ) as Rgb;
}

/**
 * Log exposure relative to E_mid per channel (after balance, exposure, change of primaries and saturation) of one pixel.
 * @example relativeLogExposure(resolveInversion(params), params, [30000, 30000, 30000])
 */
export function relativeLogExposure(resolved: ResolvedInversion, params: InversionParams, counts: Rgb): Rgb {
  const e = filmLogExposure(resolved, params, counts);
  return applySaturation(resolved.primaries ? applyPrimaries(e, resolved.primaries) : e, resolved.saturation);
}

/**
 * Changes the primaries of relative log exposures: to linear light (grey = 1), the matrix, back to log. A colour
 * the output primaries cannot hold (a component at or below zero) is held to the relative range's floor.
 * @example applyPrimaries([0, 0, 0], WIDE_TO_LINEAR_SRGB) // ≈ [0, 0, 0]: grey stays grey
 */
export function applyPrimaries(e: Rgb, m: Matrix3): Rgb {
  const [lo, hi] = RELATIVE_LOG_EXPOSURE_RANGE;
  const floor = 10 ** lo;
  const r = 10 ** e[0],
    g = 10 ** e[1],
    b = 10 ** e[2];
  return [0, 1, 2].map((k) => {
    const v = m[k]![0] * r + m[k]![1] * g + m[k]![2] * b;
    return clamp(Math.log10(v > floor ? v : floor), lo, hi);
  }) as Rgb;
}

/**
 * Saturation in log exposure around the neutral (luminance-weighted mean), held to the relative range.
 * @example applySaturation([0.1, 0, -0.1], 1) // unchanged
 */
export function applySaturation(e: Rgb, saturation: number): Rgb {
  if (saturation === 1) return e;
  const mean = LUMINANCE_WEIGHTS[0] * e[0] + LUMINANCE_WEIGHTS[1] * e[1] + LUMINANCE_WEIGHTS[2] * e[2];
  const [lo, hi] = RELATIVE_LOG_EXPOSURE_RANGE;
  return [
    clamp(mean + saturation * (e[0] - mean), lo, hi),
    clamp(mean + saturation * (e[1] - mean), lo, hi),
    clamp(mean + saturation * (e[2] - mean), lo, hi),
  ];
}

/**
 * The plain per-pixel inversion: 16-bit counts in, output code values (0..255 or 0..65535) out.
 * The reference the compiled fast path is checked against.
 * @example invertPixel(params, [20000, 21000, 22000]) // e.g. [141, 133, 120]
 */
export function invertPixel(
  params: InversionParams,
  counts: Rgb,
  resolved: ResolvedInversion = resolveInversion(params),
): Rgb {
  const e = relativeLogExposure(resolved, params, counts);
  return [
    Math.round(resolved.encode(e[0])),
    Math.round(resolved.encode(e[1])),
    Math.round(resolved.encode(e[2])),
  ];
}

/**
 * Scene-linear value per channel (18 % grey at E_mid) of one pixel, no tone curve: for colour measurement.
 * @example sceneLinearPixel(params, counts) // ≈ [0.18, 0.18, 0.18] for a mid-grey patch
 */
export function sceneLinearPixel(
  params: InversionParams,
  counts: Rgb,
  resolved: ResolvedInversion = resolveInversion(params),
): Rgb {
  const e = relativeLogExposure(resolved, params, counts);
  return [MID_GREY * 10 ** e[0], MID_GREY * 10 ** e[1], MID_GREY * 10 ** e[2]];
}
