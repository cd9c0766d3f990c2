import type { Balance, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import { densityAboveBase } from '../density';
import type { Region, RgbImage } from '../film-base';
import { labD50ToLabD65, labD50ToLinearSrgb } from '../forward-model';
import type { MonotoneCurve } from '../monotone-curve';
import { LOG_EXPOSURE_PER_STOP, ZERO_BALANCE } from '../printer-points';
import { multiply3, type Matrix3, type Rgb } from '../srgb';
import { MID_GREY } from '../tone-curve';
import { bracketBalance, type BracketFrameBalance } from './bracket-balance';
import {
  CROSS_VALIDATION_GAP_LIMIT,
  MIN_BRACKET_FRAMES,
  NEUTRAL_CAST_LIMIT,
  RESIDUAL_LIMIT,
  type CalibrationWarning,
} from './calibration-warning';
import { fitChartColour } from './chart-colour-fit';
import { chartDeltaE, type ChartDeltaE } from './chart-delta-e';
import { fitCharacteristicCurve, type CharacteristicCurveFit } from './characteristic-curve-fit';
import { chartGridFromCorners, chartGridFromRegion, type ChartGrid } from './chart-grid';
import { CHART_NEUTRAL_INDICES, CHART_REFERENCE, type ChartReferencePatch } from './chart-reference';
import { reproducePatch } from './colour-matrix-fit';
import { fitCrosstalk, type CrosstalkFit } from './crosstalk-fit';
import type { Point } from './homography';
import { sampleRegion, type RegionSample, type SampleRegionOptions } from './sample-region';
import { speedPoint, type SpeedPoint } from './speed-point';
import { usableBrackets } from './usable-brackets';

/** The stock a calibration builds a profile for. */
export interface CalibrationStock {
  name: string;
  /** Box speed. */
  iso: number;
  base: 'clear' | 'tinted' | 'masked';
  /** Profile id; default the kebab-case of the name. */
  id?: string;
}

/** Sampled measurements of a calibration roll, the input of `fitCalibration`. */
export interface CalibrationMeasurements {
  /** Film base (unexposed film: leader or rebate) as linear light, 0..1 of full scale. */
  base: Rgb;
  /** The grey card frames: exposure in stops from the metered exposure, and the sampled grey. */
  brackets: { stops: number; sample: RegionSample }[];
  /** The chart's patches in reference order, each sampled. */
  chart: RegionSample[];
  /**
   * More frames of the same chart at other exposures (e.g. 2 stops over, 1 under), each patch sampled, with the
   * stops they were shot at when known (their exposure is found from their neutral row either way).
   */
  moreCharts?: { samples: RegionSample[]; stops?: number }[];
  stock: CalibrationStock;
  /** Published chart values; default CHART_REFERENCE. */
  reference?: readonly ChartReferencePatch[];
}

/** Images and marks of a calibration roll, the input of `buildCalibration`. */
export interface CalibrationInput {
  scanner: ScannerProfile;
  /** Film base as linear light (e.g. from `baseFromRegion` on the leader or a rebate). */
  base: Rgb;
  /** Grey card frames, each with its exposure in stops and the rectangle of grey to sample. */
  brackets: { image: RgbImage; stops: number; region: Region }[];
  /** The chart frame with its four corners (patch 1, 6, 24, 19 in that order) or an axis-aligned region. */
  chart: { image: RgbImage; corners?: readonly Point[]; region?: Region };
  /** More frames of the same chart at other exposures, each with its corners or region and its stops if known. */
  moreCharts?: { image: RgbImage; corners?: readonly Point[]; region?: Region; stops?: number }[];
  stock: CalibrationStock;
  reference?: readonly ChartReferencePatch[];
  sample?: SampleRegionOptions;
}

/** Everything a calibration computes. Log exposures are relative: 0 = the metered grey. */
export interface CalibrationResult {
  /** The profile's curves per channel (after crosstalk). */
  curves: { red: CharacteristicCurveFit; green: CharacteristicCurveFit; blue: CharacteristicCurveFit };
  /** The curves as measured (before crosstalk), which the speed point is read from. */
  measuredCurves: {
    red: CharacteristicCurveFit;
    green: CharacteristicCurveFit;
    blue: CharacteristicCurveFit;
  };
  /** γ of the profile's curves, per channel. */
  gamma: Rgb;
  speedPoint: SpeedPoint;
  /** Exposure index implied by the speed point. */
  ei: number;
  /** The profile's balance (zero: its per-channel curves make every grey neutral) and each grey frame's. */
  balance: { profile: Balance; frames: BracketFrameBalance[]; mean: Balance };
  /** How far one balance fits the whole bracket, points. */
  spread: { range: Balance; standardDeviation: Balance; largestRange: number };
  /** The density crosstalk: the fitted matrix (with the colour fit), and the density-only fit it started from. */
  crosstalk: CrosstalkFit;
  /**
   * The exposure-space colour matrix, from the film's recorded exposures (linear, in its layers' own primaries) to
   * linear sRGB, rows summing to 1; fitted together with the crosstalk.
   */
  exposureMatrix: Matrix3;
  /** Exposure of the chart frame found from its neutral row, stops from the metered exposure. */
  chartExposureStops: number;
  deltaE: ChartDeltaE;
  /** Usable frames, by index into the input's brackets. */
  usedFrames: number[];
  warnings: CalibrationWarning[];
  profileDocument: ProfileDocument;
}

/** Log exposure the profile documents put 18 % grey at, as the forward model and demo profiles do: log10 0.18. */
export const PROFILE_GREY_LOG_EXPOSURE = Math.log10(MID_GREY);
/** Tone of a freshly calibrated profile: the demo profiles' print tone (invented values, from memory). */
const DEFAULT_TONE = { contrast: 1.15, blackPoint: 0.002, whitePoint: 1.1 };

const CHANNELS = ['red', 'green', 'blue'] as const;

/**
 * Samples a calibration roll (grey rectangles, the chart's patch grid) and fits it: see `fitCalibration`.
 * Also returns the chart grid so the UI can draw every patch's sampling area. Throws a RangeError when the
 * chart has neither corners nor region, or when fewer than two grey frames are usable.
 * @example buildCalibration({ scanner, base, brackets, chart: { image, corners }, stock: { name: 'Test 200', iso: 200, base: 'clear' } }).gamma // ≈ [0.6, 0.63, 0.68]
 */
export function buildCalibration(input: CalibrationInput): CalibrationResult & { grid: ChartGrid } {
  const reference = input.reference ?? CHART_REFERENCE;
  const { corners, region } = input.chart;
  if (!corners && !region) throw new RangeError('Expected corners or region for chart but received neither');
  const grid = corners ? chartGridFromCorners(corners) : chartGridFromRegion(region!);
  if (grid.patches.length !== reference.length)
    throw new RangeError(
      `Expected a reference of ${grid.patches.length} patches but received ${reference.length}`,
    );
  const brackets = input.brackets.map((b) => ({
    stops: b.stops,
    sample: sampleRegion(b.image, input.scanner, b.region, input.sample),
  }));
  const chart = grid.patches.map((p) =>
    sampleRegion(input.chart.image, input.scanner, p.sample, input.sample),
  );
  const moreCharts = (input.moreCharts ?? []).map((c, k) => {
    if (!c.corners && !c.region)
      throw new RangeError(`Expected corners or region for moreCharts[${k}] but received neither`);
    const g = c.corners ? chartGridFromCorners(c.corners) : chartGridFromRegion(c.region!);
    return {
      samples: g.patches.map((p) => sampleRegion(c.image, input.scanner, p.sample, input.sample)),
      ...(c.stops === undefined ? {} : { stops: c.stops }),
    };
  });
  return {
    ...fitCalibration({ base: input.base, brackets, chart, moreCharts, stock: input.stock, reference }),
    grid,
  };
}

/**
 * Fits a calibration from sampled measurements.
 *
 * 1. Grey frames: densities above base per channel against relative log exposure (stops × log10 2);
 *    clipped, empty or blank frames are left out with a warning. Each channel's measured curve G is
 *    fitted (`fitCharacteristicCurve`); the speed point is read from these (`speedPoint`, ISO 5800).
 * 2. Chart frames (the metered one, then any `moreCharts`): each frame's exposure is found from its neutral
 *    row (green, median over the six patches). The density-only crosstalk is fitted by least squares on the
 *    first frame (`fitCrosstalk`: each patch's published L*a*b* D50 → XYZ → Bradford to D65 → linear sRGB as
 *    its exposures); from there the density crosstalk M and the exposure-space colour matrix P are fitted
 *    together over every frame, minimising CIEDE2000 with the neutral axis held (`fitChartColour`), and each
 *    patch is cross-validated by a fit without it.
 * 3. The profile's curves F = M·G at the bracket's exposures, γ, toe and shoulder from them.
 * 4. Each grey frame's neutral balance and its spread (`bracketBalance`); ΔE00 of every patch in
 *    reference rendering before (G, no matrices), after (the profile: training) and cross-validated, per
 *    frame too (`chartDeltaE`); warnings, among them a memorised chart when the cross-validated mean
 *    exceeds the training mean by more than CROSS_VALIDATION_GAP_LIMIT.
 *
 * Throws a RangeError when fewer than two grey frames are usable or a chart frame has the wrong patch count.
 * @example fitCalibration(measurements).profileDocument.crosstalk // e.g. [[1.08, -0.06, -0.02], …]
 */
export function fitCalibration(input: CalibrationMeasurements): CalibrationResult {
  const reference = input.reference ?? CHART_REFERENCE;
  if (input.chart.length !== reference.length)
    throw new RangeError(`Expected ${reference.length} chart samples but received ${input.chart.length}`);
  (input.moreCharts ?? []).forEach((c, k) => {
    if (c.samples.length !== reference.length)
      throw new RangeError(
        `Expected ${reference.length} chart samples for moreCharts[${k}] but received ${c.samples.length}`,
      );
  });
  input.base.forEach((b, c) => {
    if (!(typeof b === 'number' && b > 0 && b <= 1))
      throw new RangeError(
        `Expected number above 0 and at most 1 for base[${c}] but received ${b} of type ${typeof b}`,
      );
  });
  const warnings: CalibrationWarning[] = [];
  const density = (rgb: Rgb) => rgb.map((v, c) => densityAboveBase(v, input.base[c]!)) as Rgb;

  // 1. Grey frames.
  const usable = usableBrackets(input.brackets, density, warnings);
  if (usable.length < 2)
    throw new RangeError(`Expected at least 2 usable grey frames but received ${usable.length}`);
  if (usable.length < MIN_BRACKET_FRAMES)
    warnings.push({
      severity: 'warning',
      code: 'too-few-brackets',
      message: `Only ${usable.length} usable grey frames: at least ${MIN_BRACKET_FRAMES} are needed, so the straight part holds 3 points (a line through 2 always fits) and toe and shoulder at least one each. Shoot a wider bracket.`,
    });

  const logExposures = usable.map((u) => u.stops * LOG_EXPOSURE_PER_STOP);
  const measuredCurves = fitChannels(
    (c) => usable.map((u, i) => ({ logExposure: logExposures[i]!, density: u.densities[c]! })),
    'measured',
    warnings,
  );
  const g = [measuredCurves.red.curve, measuredCurves.green.curve, measuredCurves.blue.curve] as const;
  const lowest = [0, 1, 2].map((c) => Math.min(...usable.map((u) => u.densities[c]!))) as Rgb;
  const speed = speedPoint(g, input.stock.iso, lowest);
  speed.extrapolated.forEach((e, c) => {
    if (e)
      warnings.push({
        severity: 'warning',
        code: 'speed-point-extrapolated',
        channel: CHANNELS[c],
        message: `The ${CHANNELS[c]} speed point (0.15 above base) lies below the darkest grey frame and was extrapolated; add frames at less exposure.`,
      });
  });

  // 2. Each chart frame's exposure from its neutral row; the density-only crosstalk (least squares) as the start of
  //    the colour fit, which then fits the crosstalk and the exposure-space matrix together over every frame.
  const charts = [{ samples: input.chart }, ...(input.moreCharts ?? [])];
  const frames = charts.map((c, k) => {
    const densities = c.samples.map((s) => (s.status === 'ok' ? density(s.rgb) : null));
    c.samples.forEach((s, i) => {
      if (s.status !== 'ok')
        warnings.push({
          severity: 'warning',
          code: 'clipped-patch',
          patch: reference[i]!.index,
          message: `${k ? `Chart frame ${k + 1}: c` : 'C'}hart patch ${reference[i]!.index} (${reference[i]!.name}) is ${s.status === 'empty' ? 'outside the frame' : 'clipped'}; it was left out.`,
        });
    });
    const stops = 'stops' in c ? c.stops : undefined;
    return {
      densities,
      offset: neutralRowOffset(densities, g[1], reference),
      ...(stops === undefined ? {} : { labelledStops: stops }),
    };
  });
  const patchesLinear = reference.map((r) => labD50ToLinearSrgb(r.labD50));
  const chartOffset = frames[0]!.offset;
  const patchLogExposure = (i: number): Rgb =>
    patchesLinear[i]!.map((v) => (v > 0 ? Math.log10(v / MID_GREY) + chartOffset : Number.NaN)) as Rgb;
  const start = fitCrosstalk(
    frames[0]!.densities.flatMap((d, i) => (d ? [{ densities: d, logExposure: patchLogExposure(i) }] : [])),
    g,
  );
  const xs = [...new Set(logExposures)].sort((a, b) => a - b);
  const colour = fitChartColour({
    frames,
    reference: reference.map((r) => labD50ToLabD65(r.labD50)),
    measuredCurves: g,
    bracketLogExposures: xs,
    lowestDensity: lowest,
    startCrosstalk: start.matrix,
  });
  const m = colour.crosstalk,
    p = colour.exposureMatrix;

  // 3. The profile's curves F = M·G at the bracket's exposures.
  const curves = fitChannels(
    (c) =>
      xs.map((x) => ({
        logExposure: x,
        density: m[c]![0] * g[0].evaluate(x) + m[c]![1] * g[1].evaluate(x) + m[c]![2] * g[2].evaluate(x),
      })),
    'profile',
    warnings,
  );
  const f = [curves.red.curve, curves.green.curve, curves.blue.curve] as const;

  // 4. Balance, ΔE00 (training and cross-validated), warnings.
  const balance = bracketBalance(
    usable.map((u) => ({ stops: u.stops, densities: multiply3(m, u.densities) })),
    f[1],
  );
  const deltaE = chartDeltaE({
    reference,
    frames,
    before: (d, offset) => reproducePatch(d, offset, IDENTITY, g, IDENTITY),
    after: (d, offset) => reproducePatch(d, offset, m, f, p),
    crossValidated: colour.crossValidated,
    usable: colour.usable,
  });
  const neutral = deltaE.patches.filter((q) => CHART_NEUTRAL_INDICES.includes(q.index) && q.measured);
  if (neutral.length) {
    const da = neutral.reduce((s, q) => s + q.after[1] - q.reference[1], 0) / neutral.length;
    const db = neutral.reduce((s, q) => s + q.after[2] - q.reference[2], 0) / neutral.length;
    if (Math.abs(da) > NEUTRAL_CAST_LIMIT || Math.abs(db) > NEUTRAL_CAST_LIMIT)
      warnings.push({
        severity: 'warning',
        code: 'badly-lit-chart',
        message: `The chart's neutral row is not neutral after balance (mean Δa* ${da.toFixed(1)}, Δb* ${db.toFixed(1)}; limit ±${NEUTRAL_CAST_LIMIT}): the chart was lit unlike the grey card. Reshoot it in the grey card's light.`,
      });
  }
  const gap = deltaE.crossValidated.mean - deltaE.after.mean;
  if (gap > CROSS_VALIDATION_GAP_LIMIT)
    warnings.push({
      severity: 'warning',
      code: 'memorised-chart',
      message: `Each patch predicted by a fit without it is off by mean ΔE00 ${deltaE.crossValidated.mean.toFixed(2)}, against ${deltaE.after.mean.toFixed(2)} for the patches the fit saw (limit ${CROSS_VALIDATION_GAP_LIMIT} apart): the colour matrices follow this chart more than the film. Add chart frames at other exposures or check the chart's patches for glare and dust.`,
    });

  const id =
    input.stock.id ??
    (input.stock.name
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '') ||
      'calibrated');
  const profileDocument: ProfileDocument = {
    schemaVersion: 1,
    id,
    version: 1,
    stock: { name: input.stock.name, process: 'C-41', base: input.stock.base, iso: input.stock.iso },
    curves: {
      red: { points: absolute(curves.red) },
      green: { points: absolute(curves.green) },
      blue: { points: absolute(curves.blue) },
    },
    crosstalk: m.map((row) => row.map((v) => round(v, 6))) as Matrix3,
    exposureMatrix: p.map((row) => row.map((v) => round(v, 6))) as Matrix3,
    balance: { ...ZERO_BALANCE },
    tone: { ...DEFAULT_TONE },
    saturation: 1,
  };
  return {
    curves,
    measuredCurves,
    gamma: [curves.red.gamma, curves.green.gamma, curves.blue.gamma],
    speedPoint: speed,
    ei: speed.ei,
    balance: { profile: { ...ZERO_BALANCE }, frames: balance.frames, mean: balance.mean },
    spread: {
      range: balance.range,
      standardDeviation: balance.standardDeviation,
      largestRange: balance.largestRange,
    },
    crosstalk: { ...start, matrix: m },
    exposureMatrix: p,
    chartExposureStops: chartOffset / LOG_EXPOSURE_PER_STOP,
    deltaE,
    usedFrames: usable.map((u) => u.frame),
    warnings,
    profileDocument,
  };
}

type ChannelFits = {
  red: CharacteristicCurveFit;
  green: CharacteristicCurveFit;
  blue: CharacteristicCurveFit;
};

function fitChannels(
  points: (c: 0 | 1 | 2) => { logExposure: number; density: number }[],
  kind: 'measured' | 'profile',
  warnings: CalibrationWarning[],
): ChannelFits {
  const fits = ([0, 1, 2] as const).map((c) => {
    const fit = fitCharacteristicCurve(points(c));
    const channel = CHANNELS[c];
    const what =
      kind === 'measured' ? `The measured ${channel} densities` : `The ${channel} curve after crosstalk`;
    if (fit.adjusted)
      warnings.push({
        severity: 'warning',
        code: 'non-monotone',
        channel,
        message: `${what} do not rise steadily with exposure (a noisy or mislabelled series?); made monotone by isotonic regression. Check each frame's stops.`,
      });
    if (fit.residualRms > RESIDUAL_LIMIT || fit.straightPart.residualRms > RESIDUAL_LIMIT)
      warnings.push({
        severity: 'warning',
        code: 'large-residuals',
        channel,
        message: `${what} leave an RMS density residual of ${Math.max(fit.residualRms, fit.straightPart.residualRms).toFixed(3)} (limit ${RESIDUAL_LIMIT}).`,
      });
    return fit;
  });
  return { red: fits[0]!, green: fits[1]!, blue: fits[2]! };
}

function absolute(fit: CharacteristicCurveFit) {
  return fit.points.map((p) => ({
    logExposure: round(p.logExposure + PROFILE_GREY_LOG_EXPOSURE, 6),
    density: round(p.density, 6),
  }));
}

/** Log exposure of a chart frame from the metered exposure: median over its neutral row of the green curve's reading less the patch's published luminance. */
function neutralRowOffset(
  densities: readonly (Rgb | null)[],
  green: MonotoneCurve,
  reference: readonly ChartReferencePatch[],
): number {
  const offsets = CHART_NEUTRAL_INDICES.flatMap((index) => {
    const i = reference.findIndex((r) => r.index === index);
    const d = i >= 0 ? densities[i] : null;
    if (!d) return [];
    return [green.inverse(d[1]) - Math.log10(labD50ToLinearSrgb(reference[i]!.labD50)[1] / MID_GREY)];
  });
  return offsets.length ? median(offsets) : 0;
}

const IDENTITY: Matrix3 = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

function round(v: number, digits: number): number {
  const k = 10 ** digits;
  return Math.round(v * k) / k;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[n >> 1]! : 0.5 * (s[n / 2 - 1]! + s[n / 2]!);
}
