import { deltaE2000 } from '../delta-e';
import { labD50ToLabD65, labD50ToLinearSrgb } from '../forward-model';
import { LOG_EXPOSURE_PER_STOP } from '../printer-points';
import type { Rgb } from '../srgb';
import { CHART_NEUTRAL_INDICES, type ChartReferencePatch } from './chart-reference';
import type { ChartFrameDensities } from './colour-matrix-fit';

/** One chart patch's colour accuracy in reference rendering. */
export interface PatchDeltaE {
  index: number;
  name: string;
  /** Published value adapted to D65 (Bradford), L*a*b*. */
  reference: Rgb;
  /** Reproduced L*a*b* (D65) with the measured curves and no colour correction. */
  before: Rgb;
  /** Reproduced L*a*b* (D65) with the built profile (training: the fit saw this patch). */
  after: Rgb;
  /** Reproduced L*a*b* (D65) by matrices fitted without this patch (leave-one-patch-out); NaN when not usable. */
  crossValidated: Rgb;
  deltaEBefore: number;
  deltaEAfter: number;
  deltaECrossValidated: number;
  /** False when the published colour lies outside the sRGB gamut (cyan): held apart from means. */
  inGamut: boolean;
  /** False when the patch was not used (clipped or empty sample). */
  measured: boolean;
}

/** Mean and largest ΔE00. */
export interface DeltaESummary {
  mean: number;
  max: number;
}

/** What one chart frame gives the fit and how well the profile reproduces it. */
export interface ChartFrameReport {
  /** The frame's exposure found from its neutral row, stops from the metered exposure. */
  exposureStops: number;
  /** The stops the frame was labelled with, when it was. */
  labelledStops?: number;
  /** Patches of this frame the fit used. */
  patchesUsed: number;
  /** ΔE00 over its in-gamut measured patches, with the profile, printed back by its exposure. */
  after: DeltaESummary;
}

/** Per-patch ΔE00 and summaries over the in-gamut, measured patches of the first (metered) chart frame. */
export interface ChartDeltaE {
  patches: PatchDeltaE[];
  before: DeltaESummary;
  /** Training figures: the profile against the patches it was fitted to. */
  after: DeltaESummary;
  /** Leave-one-patch-out figures: each patch predicted by a fit without it. */
  crossValidated: DeltaESummary;
  /** Largest |Δa*| and |Δb*| over the neutral row (patches 19–24), with the profile. */
  neutral: { a: number; b: number };
  /** Every chart frame, the first one first. */
  frames: ChartFrameReport[];
}

const NAN3: Rgb = [Number.NaN, Number.NaN, Number.NaN];

/**
 * ΔE00 (CIEDE2000, Sharma, Wu & Dalal 2005) of every chart patch against its published value adapted to D65
 * (Bradford): before (no colour correction), after (the profile) and cross-validated, with the means and maxima over
 * the in-gamut measured patches of the first frame, and each frame's own figures.
 * @example chartDeltaE({ reference, frames, before, after, crossValidated, usable }).crossValidated.mean // e.g. 0.9
 */
export function chartDeltaE(input: {
  reference: readonly ChartReferencePatch[];
  frames: readonly (ChartFrameDensities & { labelledStops?: number })[];
  before: (densities: Rgb, offset: number) => Rgb;
  after: (densities: Rgb, offset: number) => Rgb;
  crossValidated: readonly (Rgb | null)[];
  usable: readonly (readonly boolean[])[];
}): ChartDeltaE {
  const refs = input.reference.map((r) => labD50ToLabD65(r.labD50));
  const inGamut = input.reference.map((r) => labD50ToLinearSrgb(r.labD50).every((v) => v >= 0 && v <= 1));
  const first = input.frames[0]!;
  const patches: PatchDeltaE[] = input.reference.map((r, i) => {
    const d = first.densities[i] ?? null;
    const before = d ? input.before(d, first.offset) : NAN3;
    const after = d ? input.after(d, first.offset) : NAN3;
    const cv = input.crossValidated[i] ?? NAN3;
    return {
      index: r.index,
      name: r.name,
      reference: refs[i]!,
      before,
      after,
      crossValidated: cv,
      deltaEBefore: d ? deltaE2000(before, refs[i]!) : Number.NaN,
      deltaEAfter: d ? deltaE2000(after, refs[i]!) : Number.NaN,
      deltaECrossValidated: input.crossValidated[i] ? deltaE2000(cv, refs[i]!) : Number.NaN,
      inGamut: inGamut[i]!,
      measured: d !== null,
    };
  });
  const counted = patches.filter((p) => p.inGamut && p.measured);
  const neutral = patches.filter((p) => CHART_NEUTRAL_INDICES.includes(p.index) && p.measured);
  const frames = input.frames.map((frame, f): ChartFrameReport => {
    const errors = frame.densities.flatMap((d, i) =>
      d && inGamut[i] ? [deltaE2000(input.after(d, frame.offset), refs[i]!)] : [],
    );
    return {
      exposureStops: frame.offset / LOG_EXPOSURE_PER_STOP,
      ...(frame.labelledStops === undefined ? {} : { labelledStops: frame.labelledStops }),
      patchesUsed: input.usable[f]!.filter(Boolean).length,
      after: summarise(errors),
    };
  });
  return {
    patches,
    before: summarise(counted.map((p) => p.deltaEBefore)),
    after: summarise(counted.map((p) => p.deltaEAfter)),
    crossValidated: summarise(counted.map((p) => p.deltaECrossValidated).filter(Number.isFinite)),
    neutral: {
      a: Math.max(0, ...neutral.map((p) => Math.abs(p.after[1] - p.reference[1]))),
      b: Math.max(0, ...neutral.map((p) => Math.abs(p.after[2] - p.reference[2]))),
    },
    frames,
  };
}

function summarise(values: readonly number[]): DeltaESummary {
  return values.length
    ? { mean: values.reduce((s, v) => s + v, 0) / values.length, max: Math.max(...values) }
    : { mean: Number.NaN, max: Number.NaN };
}
