import type { CalibrationFit, CalibrationResiduals, FittedCurve } from '@clearbase/contracts';
import {
  CROSS_VALIDATION_GAP_LIMIT,
  LOG_EXPOSURE_PER_STOP,
  multiply3,
  type CalibrationResult,
  type CharacteristicCurveFit,
  type RegionSample,
  type Rgb,
} from '@clearbase/inversion';
import { clampRgb, formatHex } from 'culori';

const round = (v: number, digits = 6) => Math.round(v * 10 ** digits) / 10 ** digits;
const finiteOrNull = (v: number) => (Number.isFinite(v) ? round(v) : null);
const summaryOf = (s: { mean: number; max: number }) => ({
  mean: finiteOrNull(s.mean),
  max: finiteOrNull(s.max),
});
const roundRgb = (v: Rgb) => v.map((x) => round(x)) as Rgb;

function curveOf(f: CharacteristicCurveFit): FittedCurve {
  const { curve: _curve, ...rest } = f;
  return rest;
}

/** #rrggbb of a L*a*b* (D65) colour, clipped into sRGB. */
function labHex(lab: Rgb): string {
  return formatHex(clampRgb({ mode: 'lab65', l: lab[0], a: lab[1], b: lab[2] }));
}

/** The stored form of a fit: plain numbers, swatches as hex, the grey frames' densities after crosstalk. */
export function describeFit(
  r: CalibrationResult,
  samples: readonly { stops: number; sample: RegionSample }[],
  base: Rgb,
  baseSource: 'leader' | 'frames',
  iso: number,
  seconds: number,
): CalibrationFit {
  const m = r.crosstalk.matrix;
  const greyPoints = r.usedFrames.map((frame) => {
    const s = samples[frame]!;
    const densities = s.sample.rgb.map((v, c) => Math.log10(base[c]! / v)) as Rgb;
    return {
      stops: s.stops,
      logExposure: round(s.stops * LOG_EXPOSURE_PER_STOP),
      densities: multiply3(m, densities).map((d) => round(d)) as Rgb,
    };
  });
  return {
    gamma: r.gamma.map((g) => round(g)) as Rgb,
    curves: { red: curveOf(r.curves.red), green: curveOf(r.curves.green), blue: curveOf(r.curves.blue) },
    greyPoints,
    speedPoint: r.speedPoint,
    ei: r.ei,
    iso,
    balance: { frames: r.balance.frames, mean: r.balance.mean },
    spread: r.spread,
    crosstalk: m,
    exposureMatrix: r.exposureMatrix.map((row) => roundRgb(row)) as CalibrationFit['crosstalk'],
    chartExposureStops: r.chartExposureStops,
    deltaE: {
      patches: r.deltaE.patches.map((p) => ({
        index: p.index,
        name: p.name,
        reference: p.reference,
        after: p.measured ? p.after : null,
        deltaEBefore: finiteOrNull(p.deltaEBefore),
        deltaEAfter: finiteOrNull(p.deltaEAfter),
        crossValidated: Number.isFinite(p.deltaECrossValidated) ? roundRgb(p.crossValidated) : null,
        deltaECrossValidated: finiteOrNull(p.deltaECrossValidated),
        inGamut: p.inGamut,
        measured: p.measured,
        referenceHex: labHex(p.reference),
        afterHex: p.measured ? labHex(p.after) : null,
      })),
      before: summaryOf(r.deltaE.before),
      after: summaryOf(r.deltaE.after),
      crossValidated: summaryOf(r.deltaE.crossValidated),
      neutral: { a: round(r.deltaE.neutral.a), b: round(r.deltaE.neutral.b) },
      frames: r.deltaE.frames.map((f) => ({
        exposureStops: round(f.exposureStops),
        labelledStops: f.labelledStops ?? null,
        patchesUsed: f.patchesUsed,
        after: summaryOf(f.after),
      })),
      memorisedChart: r.deltaE.crossValidated.mean - r.deltaE.after.mean > CROSS_VALIDATION_GAP_LIMIT,
    },
    base: { rgb: base, source: baseSource },
    usedFrames: r.usedFrames,
    seconds: round(seconds, 3),
  };
}

/** The stored residuals of a fit: RMS of the measured and profile curves, their straight parts and the crosstalk fit. */
export function residualsOf(r: CalibrationResult): CalibrationResiduals {
  const per = (c: CalibrationResult['curves'], pick: (f: CharacteristicCurveFit) => number) =>
    [pick(c.red), pick(c.green), pick(c.blue)].map((v) => round(v)) as Rgb;
  return {
    measuredCurves: per(r.measuredCurves, (f) => f.residualRms),
    profileCurves: per(r.curves, (f) => f.residualRms),
    straightParts: per(r.curves, (f) => f.straightPart.residualRms),
    crosstalk: r.crosstalk.residualRms.map((v) => round(v)) as Rgb,
  };
}
