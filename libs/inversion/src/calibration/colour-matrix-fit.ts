import { deltaE2000 } from '../delta-e';
import { D65_WHITE, xyzToLab } from '../lab';
import type { MonotoneCurve } from '../monotone-curve';
import { linearSrgbToXyz, type Matrix3, type Rgb } from '../srgb';
import { MID_GREY } from '../tone-curve';
import { fitCharacteristicCurve } from './characteristic-curve-fit';
import { levenbergMarquardt } from './levenberg-marquardt';

/** One chart frame for the colour fit: each patch's densities above base (null: not measured) and its exposure. */
export interface ChartFrameDensities {
  densities: readonly (Rgb | null)[];
  /** The frame's log exposure from the metered exposure (found from its neutral row). */
  offset: number;
}

/** Inputs of `fitColourMatrices`. */
export interface ColourFitInput {
  frames: readonly ChartFrameDensities[];
  /** Each patch's published value adapted to D65, L*a*b*, in chart order. */
  reference: readonly Rgb[];
  /** The bracket's measured curves (density above base against log exposure from the metered grey), per channel. */
  measuredCurves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve];
  /** The bracket's log exposures: the profile's curves F = M·G are sampled there. */
  bracketLogExposures: readonly number[];
  /** What the ridge pulls towards, and where the fit starts unless `start` says otherwise. */
  prior: { crosstalk: Matrix3; exposureMatrix: Matrix3 };
  /** Where the fit starts; default `prior`. */
  start?: { crosstalk: Matrix3; exposureMatrix: Matrix3 };
  /** Patches (0-based) the fit may use, per frame; the others are left out. */
  usable: readonly (readonly boolean[])[];
  /** Weight of the pull towards `prior` (see COLOUR_FIT_RIDGE), ΔE00² per squared unit of a matrix element. */
  ridge?: number;
}

/** The fitted pair of matrices and the profile's curves they imply. */
export interface ColourMatrices {
  /** Density crosstalk, D' = M·D, rows summing to 1. */
  crosstalk: Matrix3;
  /** Exposure-space colour matrix from the film's recorded exposures (linear, grey = 1) to linear sRGB, rows summing to 1. */
  exposureMatrix: Matrix3;
  /** The profile's curves F = M·G per channel. */
  curves: [MonotoneCurve, MonotoneCurve, MonotoneCurve];
  /** Root mean square ΔE00 over the patches used. */
  rmsDeltaE: number;
  iterations: number;
}

/**
 * Weight of the pull of the fit towards its prior: the fit minimises Σ ΔE00² + ridge · Σ (element − prior)², so an
 * element a tenth away costs as much as one patch off by 0.055 ΔE00 (chosen: enough to pin an element the chart
 * cannot, too little to hold one it can; on the test film models the cross-validated means moved by under 0.03
 * ΔE00 for weights from 0 to 1, and worsened above — at 3 one model's went from 0.74 to 1.04).
 */
export const COLOUR_FIT_RIDGE = 0.3;

/**
 * Fits the density crosstalk M and the exposure-space colour matrix P together, minimising CIEDE2000 (Sharma, Wu &
 * Dalal 2005, via `deltaE2000`) between each usable patch of every frame, reproduced as the reference rendering does
 * (M·D, the profile's curves F = M·G inverted, to linear light at the frame's exposure, P, XYZ, L*a*b* D65), and
 * its published value (Bradford-adapted to D65). Both matrices keep every row summing to 1 — the neutral axis is
 * held: a grey, whose densities lie on the bracket's curves, stays grey through M and F, and equal exposures stay
 * equal through P, so white maps to white — by fitting two elements a row and setting the third (a projection onto
 * the constraint); 12 free parameters. Solved by `levenbergMarquardt` with a small ridge towards `prior`.
 * @example fitColourMatrices(input).exposureMatrix // e.g. [[1.21, -0.18, -0.03], …]
 */
export function fitColourMatrices(input: ColourFitInput): ColourMatrices {
  const ridge = Math.sqrt(input.ridge ?? COLOUR_FIT_RIDGE);
  const theta0 = [...freeElements(input.prior.crosstalk), ...freeElements(input.prior.exposureMatrix)];
  const start = input.start ?? input.prior;
  // The patches' linear exposures depend on the crosstalk only: kept for the last crosstalk seen, so the Jacobian's
  // exposure-matrix columns cost a matrix product a patch instead of three curve fits and inversions.
  let lastKey = '';
  let lastLinear: (Rgb | null)[][] | null = null;
  const linearFor = (theta: readonly number[]) => {
    const key = theta.slice(0, 6).join(',');
    if (key !== lastKey) {
      lastKey = key;
      const m = fromFree(theta.slice(0, 6));
      const curves = profileCurves(m, input.measuredCurves, input.bracketLogExposures);
      lastLinear = curves
        ? input.frames.map((frame, f) =>
            frame.densities.map((d, i) =>
              d && input.usable[f]![i] ? patchLinear(d, frame.offset, m, curves) : null,
            ),
          )
        : null;
    }
    return lastLinear;
  };
  const residuals = (theta: readonly number[]): number[] => {
    const linear = linearFor(theta);
    if (!linear) return [Infinity];
    const p = fromFree(theta.slice(6));
    const out: number[] = [];
    linear.forEach((frame) =>
      frame.forEach((lin, i) => {
        if (lin) out.push(deltaE2000(linearToLab(lin, p), input.reference[i]!));
      }),
    );
    theta.forEach((v, k) => out.push(ridge * (v - theta0[k]!)));
    return out;
  };
  const fit = levenbergMarquardt(residuals, [
    ...freeElements(start.crosstalk),
    ...freeElements(start.exposureMatrix),
  ]);
  const crosstalk = fromFree(fit.parameters.slice(0, 6)),
    exposureMatrix = fromFree(fit.parameters.slice(6));
  const curves = profileCurves(crosstalk, input.measuredCurves, input.bracketLogExposures)!;
  const used = input.frames.reduce(
    (n, frame, f) => n + frame.densities.filter((d, i) => d && input.usable[f]![i]).length,
    0,
  );
  const patchSquares = residuals(fit.parameters)
    .slice(0, used)
    .reduce((s, v) => s + v * v, 0);
  return {
    crosstalk,
    exposureMatrix,
    curves,
    rmsDeltaE: used ? Math.sqrt(patchSquares / used) : 0,
    iterations: fit.iterations,
  };
}

/**
 * A patch as the reference rendering reproduces it, L*a*b* D65: densities through the crosstalk and the profile's
 * curves to relative log exposure, to linear light with the frame's exposure taken back (18 % grey at the metered
 * exposure), through the exposure-space matrix to linear sRGB (unclipped), XYZ (IEC 61966-2-1), L*a*b*.
 * @example reproducePatch([0.7, 0.7, 0.7], 0, identity, curves, identity) // ≈ [49.5, 0, 0] when F(0) = 0.7
 */
export function reproducePatch(
  densities: Rgb,
  offset: number,
  crosstalk: Matrix3,
  curves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve],
  exposureMatrix: Matrix3,
): Rgb {
  return linearToLab(patchLinear(densities, offset, crosstalk, curves), exposureMatrix);
}

/** A patch's recorded exposures as linear light (18 % grey at the metered exposure): M·D, F⁻¹, the frame's exposure taken back. */
function patchLinear(
  densities: Rgb,
  offset: number,
  crosstalk: Matrix3,
  curves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve],
): Rgb {
  return crosstalk.map((row, c) => {
    const dp = row[0] * densities[0] + row[1] * densities[1] + row[2] * densities[2];
    return MID_GREY * 10 ** (curves[c]!.inverse(dp) - offset);
  }) as Rgb;
}

/** Recorded exposures through the exposure-space matrix to linear sRGB (unclipped), XYZ (IEC 61966-2-1), L*a*b* D65. */
function linearToLab(lin: Rgb, exposureMatrix: Matrix3): Rgb {
  const rgb = exposureMatrix.map((row) => row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2]) as Rgb;
  return xyzToLab(linearSrgbToXyz(rgb), D65_WHITE);
}

/**
 * The profile's curves F_c = Σ_k M_ck·G_k sampled at the bracket's exposures (made monotone where a matrix bends
 * them, as the profile's own fit does); null when a curve does not rise at all.
 */
export function profileCurves(
  crosstalk: Matrix3,
  measured: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve],
  logExposures: readonly number[],
): [MonotoneCurve, MonotoneCurve, MonotoneCurve] | null {
  try {
    return crosstalk.map(
      (row) =>
        fitCharacteristicCurve(
          logExposures.map((x) => ({
            logExposure: x,
            density:
              row[0] * measured[0].evaluate(x) +
              row[1] * measured[1].evaluate(x) +
              row[2] * measured[2].evaluate(x),
          })),
        ).curve,
    ) as [MonotoneCurve, MonotoneCurve, MonotoneCurve];
  } catch (error) {
    if (error instanceof RangeError) return null;
    throw error;
  }
}

/** The two off-constraint elements of each row: columns 0 and 1 (the third is 1 minus their sum). */
function freeElements(m: Matrix3): number[] {
  return m.flatMap((row) => [row[0], row[1]]);
}

function fromFree(v: readonly number[]): Matrix3 {
  return [0, 1, 2].map((r) => [v[2 * r]!, v[2 * r + 1]!, 1 - v[2 * r]! - v[2 * r + 1]!]) as Matrix3;
}
