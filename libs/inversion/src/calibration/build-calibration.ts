import type { Balance, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import { densityAboveBase } from '../density';
import type { Region, RgbImage } from '../film-base';
import { labD50ToLabD65, labD50ToLinearSrgb } from '../forward-model';
import { D65_WHITE, xyzToLab } from '../lab';
import { deltaE2000 } from '../delta-e';
import type { MonotoneCurve } from '../monotone-curve';
import { LOG_EXPOSURE_PER_STOP, ZERO_BALANCE } from '../printer-points';
import { linearSrgbToXyz, multiply3, type Matrix3, type Rgb } from '../srgb';
import { MID_GREY } from '../tone-curve';
import { bracketBalance, type BracketFrameBalance } from './bracket-balance';
import {
  BLANK_DENSITY,
  MIN_BRACKET_FRAMES,
  NEUTRAL_CAST_LIMIT,
  RESIDUAL_LIMIT,
  type CalibrationWarning,
} from './calibration-warning';
import { fitCharacteristicCurve, type CharacteristicCurveFit } from './characteristic-curve-fit';
import { chartGridFromCorners, chartGridFromRegion, type ChartGrid } from './chart-grid';
import { CHART_NEUTRAL_INDICES, CHART_REFERENCE, type ChartReferencePatch } from './chart-reference';
import { fitCrosstalk, type CrosstalkFit } from './crosstalk-fit';
import type { Point } from './homography';
import { sampleRegion, type RegionSample, type SampleRegionOptions } from './sample-region';
import { speedPoint, type SpeedPoint } from './speed-point';

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
  stock: CalibrationStock;
  reference?: readonly ChartReferencePatch[];
  sample?: SampleRegionOptions;
}

/** One chart patch's colour accuracy in reference rendering. */
export interface PatchDeltaE {
  index: number;
  name: string;
  /** Published value adapted to D65, L*a*b*. */
  reference: Rgb;
  /** Reproduced L*a*b* (D65) with the measured curves and no crosstalk correction. */
  before: Rgb;
  /** Reproduced L*a*b* (D65) with the built profile. */
  after: Rgb;
  deltaEBefore: number;
  deltaEAfter: number;
  /** False when the published colour lies outside the sRGB gamut the film model records (cyan): held apart from means. */
  inGamut: boolean;
  /** False when the patch was not used (clipped or empty sample). */
  measured: boolean;
}

/** Per-patch ΔE00 and summaries over the in-gamut, measured patches. */
export interface ChartDeltaE {
  patches: PatchDeltaE[];
  before: { mean: number; max: number };
  after: { mean: number; max: number };
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
  crosstalk: CrosstalkFit;
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
  return {
    ...fitCalibration({ base: input.base, brackets, chart, stock: input.stock, reference }),
    grid,
  };
}

/**
 * Fits a calibration from sampled measurements.
 *
 * 1. Grey frames: densities above base per channel against relative log exposure (stops × log10 2);
 *    clipped, empty or blank frames are left out with a warning. Each channel's measured curve G is
 *    fitted (`fitCharacteristicCurve`); the speed point is read from these (`speedPoint`, ISO 5800).
 * 2. Chart: its exposure is found from the neutral row (green, median over the six patches); each
 *    patch's published L*a*b* D50 → XYZ → Bradford to D65 → linear sRGB gives its log exposure per
 *    channel; the crosstalk M is fitted by least squares (`fitCrosstalk`, rows summing to 1).
 * 3. The profile's curves F = M·G at the bracket's exposures, γ, toe and shoulder from them.
 * 4. Each grey frame's neutral balance and its spread (`bracketBalance`); ΔE00 of every patch in
 *    reference rendering before (G, no matrix) and after (the profile); warnings.
 *
 * Throws a RangeError when fewer than two grey frames are usable or the chart has the wrong patch count.
 * @example fitCalibration(measurements).profileDocument.crosstalk // e.g. [[1.08, -0.06, -0.02], …]
 */
export function fitCalibration(input: CalibrationMeasurements): CalibrationResult {
  const reference = input.reference ?? CHART_REFERENCE;
  if (input.chart.length !== reference.length)
    throw new RangeError(`Expected ${reference.length} chart samples but received ${input.chart.length}`);
  input.base.forEach((b, c) => {
    if (!(typeof b === 'number' && b > 0 && b <= 1))
      throw new RangeError(
        `Expected number above 0 and at most 1 for base[${c}] but received ${b} of type ${typeof b}`,
      );
  });
  const warnings: CalibrationWarning[] = [];
  const density = (rgb: Rgb) => rgb.map((v, c) => densityAboveBase(v, input.base[c]!)) as Rgb;

  // 1. Grey frames.
  const usable: { frame: number; stops: number; densities: Rgb }[] = [];
  input.brackets.forEach((b, frame) => {
    const label = `Grey frame ${frame + 1} (${formatStops(b.stops)})`;
    if (!Number.isFinite(b.stops))
      throw new RangeError(`Expected finite stops for bracket ${frame} but received ${b.stops}`);
    if (b.sample.status === 'empty') {
      warnings.push({
        severity: 'warning',
        code: 'clipped-frame',
        frame,
        message: `${label}: the grey rectangle holds no usable pixels; it was left out.`,
      });
      return;
    }
    if (b.sample.status === 'clipped') {
      const pct = Math.round(100 * (b.sample.clippedFraction + b.sample.darkFraction));
      warnings.push({
        severity: 'warning',
        code: 'clipped-frame',
        frame,
        message: `${label}: ${pct} % of the grey rectangle is clipped (bare light or too dense to read); it was left out. Rescan it with the scanner exposure adjusted.`,
      });
      return;
    }
    usable.push({ frame, stops: b.stops, densities: density(b.sample.rgb) });
  });
  // Frames with no density above base: below the toe when every frame under them is as thin (left out, a
  // notice); blank when a frame given less exposure has density (a frame that never saw light, a warning).
  const nearBase = (u: { densities: Rgb }) => u.densities.every((d) => d < BLANK_DENSITY);
  for (const u of [...usable].filter(nearBase)) {
    const label = `Grey frame ${u.frame + 1} (${formatStops(u.stops)})`;
    const blank = usable.some((o) => o.stops < u.stops && !nearBase(o));
    warnings.push(
      blank
        ? {
            severity: 'warning',
            code: 'blank-frame',
            frame: u.frame,
            message: `${label}: the grey is within ${BLANK_DENSITY} of the film base in every channel although less exposed frames are denser — the frame looks unexposed; it was left out.`,
          }
        : {
            severity: 'notice',
            code: 'below-toe',
            frame: u.frame,
            message: `${label}: no density above the base yet (under ${BLANK_DENSITY}); it lies below the toe and was left out.`,
          },
    );
    usable.splice(usable.indexOf(u), 1);
  }
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

  // 2. Chart exposure from the neutral row, then the crosstalk fit.
  const patchesLinear = reference.map((r) => labD50ToLinearSrgb(r.labD50));
  const chartDensities = input.chart.map((s) => (s.status === 'ok' ? density(s.rgb) : null));
  input.chart.forEach((s, i) => {
    if (s.status !== 'ok')
      warnings.push({
        severity: 'warning',
        code: 'clipped-patch',
        patch: reference[i]!.index,
        message: `Chart patch ${reference[i]!.index} (${reference[i]!.name}) is ${s.status === 'empty' ? 'outside the frame' : 'clipped'}; it was left out.`,
      });
  });
  const neutralOffsets = CHART_NEUTRAL_INDICES.flatMap((index) => {
    const i = reference.findIndex((r) => r.index === index);
    const d = i >= 0 ? chartDensities[i] : null;
    if (!d) return [];
    return [g[1].inverse(d[1]) - Math.log10(patchesLinear[i]![1] / MID_GREY)];
  });
  const chartOffset = neutralOffsets.length ? median(neutralOffsets) : 0;
  const patchLogExposure = (i: number): Rgb =>
    patchesLinear[i]!.map((v) => (v > 0 ? Math.log10(v / MID_GREY) + chartOffset : Number.NaN)) as Rgb;
  const crosstalk = fitCrosstalk(
    chartDensities.flatMap((d, i) => (d ? [{ densities: d, logExposure: patchLogExposure(i) }] : [])),
    g,
  );
  const m = crosstalk.matrix;

  // 3. The profile's curves F = M·G at the bracket's exposures.
  const xs = [...new Set(logExposures)].sort((a, b) => a - b);
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

  // 4. Balance, ΔE00, warnings.
  const balance = bracketBalance(
    usable.map((u) => ({ stops: u.stops, densities: multiply3(m, u.densities) })),
    f[1],
  );
  const identity: Matrix3 = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  const reproduce = (d: Rgb, matrix: Matrix3, cs: readonly MonotoneCurve[]): Rgb => {
    const dp = multiply3(matrix, d);
    const lin = dp.map((v, c) => Math.min(1, MID_GREY * 10 ** (cs[c]!.inverse(v) - chartOffset))) as Rgb;
    return xyzToLab(linearSrgbToXyz(lin), D65_WHITE);
  };
  const patches: PatchDeltaE[] = reference.map((r, i) => {
    const ref = labD50ToLabD65(r.labD50);
    const d = chartDensities[i];
    const before = d ? reproduce(d, identity, g) : ([Number.NaN, Number.NaN, Number.NaN] as Rgb);
    const after = d ? reproduce(d, m, f) : ([Number.NaN, Number.NaN, Number.NaN] as Rgb);
    return {
      index: r.index,
      name: r.name,
      reference: ref,
      before,
      after,
      deltaEBefore: d ? deltaE2000(before, ref) : Number.NaN,
      deltaEAfter: d ? deltaE2000(after, ref) : Number.NaN,
      inGamut: patchesLinear[i]!.every((v) => v >= 0 && v <= 1),
      measured: d !== null,
    };
  });
  const counted = patches.filter((p) => p.inGamut && p.measured);
  const summary = (pick: (p: PatchDeltaE) => number) => ({
    mean: counted.length ? counted.reduce((s, p) => s + pick(p), 0) / counted.length : Number.NaN,
    max: counted.length ? Math.max(...counted.map(pick)) : Number.NaN,
  });
  const neutral = patches.filter((p) => CHART_NEUTRAL_INDICES.includes(p.index) && p.measured);
  if (neutral.length) {
    const da = neutral.reduce((s, p) => s + p.after[1] - p.reference[1], 0) / neutral.length;
    const db = neutral.reduce((s, p) => s + p.after[2] - p.reference[2], 0) / neutral.length;
    if (Math.abs(da) > NEUTRAL_CAST_LIMIT || Math.abs(db) > NEUTRAL_CAST_LIMIT)
      warnings.push({
        severity: 'warning',
        code: 'badly-lit-chart',
        message: `The chart's neutral row is not neutral after balance (mean Δa* ${da.toFixed(1)}, Δb* ${db.toFixed(1)}; limit ±${NEUTRAL_CAST_LIMIT}): the chart was lit unlike the grey card. Reshoot it in the grey card's light.`,
      });
  }
  crosstalk.residualRms.forEach((r, c) => {
    if (r > RESIDUAL_LIMIT)
      warnings.push({
        severity: 'warning',
        code: 'large-residuals',
        channel: CHANNELS[c],
        message: `The crosstalk fit of the ${CHANNELS[c]} channel leaves an RMS density residual of ${r.toFixed(3)} (limit ${RESIDUAL_LIMIT}) over the chart.`,
      });
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
    crosstalk,
    chartExposureStops: chartOffset / LOG_EXPOSURE_PER_STOP,
    deltaE: { patches, before: summary((p) => p.deltaEBefore), after: summary((p) => p.deltaEAfter) },
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

function round(v: number, digits: number): number {
  const k = 10 ** digits;
  return Math.round(v * k) / k;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[n >> 1]! : 0.5 * (s[n / 2 - 1]! + s[n / 2]!);
}

function formatStops(stops: number): string {
  return `${stops > 0 ? '+' : ''}${Number(stops.toFixed(2))} stops`;
}
