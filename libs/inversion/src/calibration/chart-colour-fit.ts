import type { MonotoneCurve } from '../monotone-curve';
import { multiply3, type Matrix3, type Rgb } from '../srgb';
import {
  fitColourMatrices,
  reproducePatch,
  type ChartFrameDensities,
  type ColourMatrices,
} from './colour-matrix-fit';

/** Inputs of `fitChartColour`. */
export interface ChartColourInput {
  /** The chart frames, the metered one (or the only one) first. */
  frames: readonly ChartFrameDensities[];
  /** Each patch's published value adapted to D65, L*a*b*. */
  reference: readonly Rgb[];
  measuredCurves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve];
  bracketLogExposures: readonly number[];
  /**
   * The lowest density the bracket measured per channel: a patch thinner than it in a channel (both after the
   * starting crosstalk) is left out.
   */
  lowestDensity: Rgb;
  /** Where the fit starts (the density-only least-squares crosstalk); the exposure matrix starts at the identity. */
  startCrosstalk: Matrix3;
  ridge?: number;
}

/** The chart's colour fit, with each patch of the first frame predicted by a fit that never saw it. */
export interface ChartColourFit extends ColourMatrices {
  /** Per frame and patch: whether the fit used it (measured, and inside the densities the bracket measured). */
  usable: boolean[][];
  /**
   * Per patch of the first frame: its L*a*b* D65 as reproduced by matrices fitted without that patch in any frame
   * (leave-one-patch-out cross-validation); null when the patch was not usable.
   */
  crossValidated: (Rgb | null)[];
}

const IDENTITY: Matrix3 = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

/**
 * Fits the density crosstalk and the exposure-space colour matrix to every chart frame (`fitColourMatrices`), then
 * cross-validates leaving one patch out: for each usable patch, the fit is made again without it (in every frame,
 * from the full fit's matrices) and the patch of the first frame is reproduced with those matrices. A profile that
 * only memorises the chart shows a cross-validated ΔE00 well above its training figure. A patch is left out of the
 * fit when any channel is thinner than the thinnest grey frame after the starting crosstalk (the film did not record
 * it within the bracket: the curve there is only extrapolated).
 * @example fitChartColour(input).crossValidated[0] // L*a*b* of patch 1 from a fit of the other 23
 */
export function fitChartColour(input: ChartColourInput): ChartColourFit {
  // Compared after the starting crosstalk, so a dye's unwanted absorption does not make an unexposed layer look exposed.
  const m0 = input.startCrosstalk;
  const floor = multiply3(m0, input.lowestDensity);
  const usable = input.frames.map((f) =>
    f.densities.map((d) => d !== null && multiply3(m0, d).every((v, c) => v >= floor[c]!)),
  );
  const common = {
    frames: input.frames,
    reference: input.reference,
    measuredCurves: input.measuredCurves,
    bracketLogExposures: input.bracketLogExposures,
    ...(input.ridge === undefined ? {} : { ridge: input.ridge }),
  };
  const prior = { crosstalk: input.startCrosstalk, exposureMatrix: IDENTITY };
  const full = fitColourMatrices({
    ...common,
    usable,
    prior,
  });
  const first = input.frames[0]!;
  const crossValidated = first.densities.map((d, i) => {
    if (!d || !usable[0]![i]) return null;
    const without = fitColourMatrices({
      ...common,
      usable: usable.map((row) => row.map((u, k) => u && k !== i)),
      prior,
      start: { crosstalk: full.crosstalk, exposureMatrix: full.exposureMatrix },
    });
    return reproducePatch(d, first.offset, without.crosstalk, without.curves, without.exposureMatrix);
  });
  return { ...full, usable, crossValidated };
}
