import type {
  CalibrationFit,
  CalibrationResiduals,
  CalibrationWarning,
  CreateCalibrationRequest,
  FittedCurve,
  PixelRegion,
  ScannerProfile,
} from '@clearbase/contracts';
import {
  baseFromRegion,
  chartGridFromCorners,
  chartGridFromRegion,
  CHART_REFERENCE,
  detectFilmBase,
  fitCalibration,
  LOG_EXPOSURE_PER_STOP,
  multiply3,
  rollBase,
  sampleRegion,
  type CalibrationResult,
  type CalibrationStock,
  type CharacteristicCurveFit,
  type ChartGrid,
  type FilmBase,
  type Point,
  type Region,
  type RegionSample,
  type Rgb,
  type RgbImage,
} from '@clearbase/inversion';
import { clampRgb, formatHex } from 'culori';
import type { FieldError } from '../errors/app-error';
import { AppError } from '../errors/app-error';
import { ImageInputError, readNegative, type NegativeImage } from '../imaging/index';

/** One uploaded frame of a calibration roll, still in the temp folder. */
export interface CalibrationUpload {
  role: 'bracket' | 'chart' | 'leader';
  /** Position in its role's list (bracket order), 0 for chart and leader. */
  index: number;
  path: string;
  fileName: string;
}

/** What was read of each frame: its size and depth, for the stored inputs. */
export interface ReadFrame {
  upload: CalibrationUpload;
  width: number;
  height: number;
  bitDepth: 8 | 16;
  format: 'tiff' | 'png';
  warnings: string[];
}

/** The outcome of fitting a calibration roll. */
export interface FittedCalibrationRoll {
  frames: ReadFrame[];
  result: CalibrationResult;
  grid: ChartGrid;
  fit: CalibrationFit;
  residuals: CalibrationResiduals;
  warnings: CalibrationWarning[];
}

/**
 * Pixels read at most from one grey rectangle: 2^16, a quarter of the library's default. The trimmed mean's standard
 * error at 0.01 D of grain is then about 0.01 / 256 D, far inside the 0.03 D residual limit (statistics; our choice),
 * and a full-size bracket samples four times faster.
 */
export const GREY_SAMPLE_PIXELS = 65_536;

const tuple = (r: PixelRegion): Region => [r.x, r.y, r.width, r.height];

/** Path of a frame in error messages: `bracket[3]`, `chart`, `leader`. */
export function framePath(u: Pick<CalibrationUpload, 'role' | 'index'>): string {
  return u.role === 'bracket' ? `bracket[${u.index}]` : u.role;
}

function regionErrors(region: PixelRegion, image: { width: number; height: number }, path: string) {
  const errors: FieldError[] = [];
  if (region.x + region.width > image.width)
    errors.push({
      path: `${path}.width`,
      message: `x + width is ${region.x + region.width}, past the frame's width of ${image.width} pixels`,
    });
  if (region.y + region.height > image.height)
    errors.push({
      path: `${path}.height`,
      message: `y + height is ${region.y + region.height}, past the frame's height of ${image.height} pixels`,
    });
  return errors;
}

/**
 * Reads a calibration roll frame by frame — each decoded, sampled and let go, so full-size scans fit in memory — and
 * fits it with `fitCalibration`. Every unreadable frame and every mark outside its frame is gathered into one 422
 * problem whose errors name the frame (`bracket[3]`, `chart`) or the mark (`bracket[3].greyRegion.width`). A roll the
 * library cannot fit (too few usable grey frames) answers 422 `calibration-not-fitted`.
 *
 * @example
 * const fitted = await fitCalibrationRoll(uploads, request, { scanner, stock, maxPixels: 120e6 });
 * fitted.fit.gamma // e.g. [0.55, 0.62, 0.7]
 */
export async function fitCalibrationRoll(
  uploads: readonly CalibrationUpload[],
  request: CreateCalibrationRequest,
  options: { scanner: ScannerProfile; stock: CalibrationStock; maxPixels: number },
): Promise<FittedCalibrationRoll> {
  const started = performance.now();
  const { scanner } = options;
  const errors: FieldError[] = [];
  const frames: ReadFrame[] = [];
  const read = async (u: CalibrationUpload): Promise<NegativeImage | null> => {
    try {
      const image = await readNegative(u.path, { maxPixels: options.maxPixels });
      if (image.format === 'jpeg') {
        errors.push({
          path: framePath(u),
          message: `${u.fileName}: the file is a JPEG; upload the scan as a 16-bit TIFF or PNG.`,
        });
        return null;
      }
      frames.push({
        upload: u,
        width: image.width,
        height: image.height,
        bitDepth: image.bitDepth,
        format: image.format,
        warnings: image.warnings,
      });
      return image;
    } catch (error) {
      if (!(error instanceof ImageInputError)) throw error;
      errors.push({ path: framePath(u), message: `${u.fileName}: ${error.message}` });
      return null;
    }
  };

  const grid = request.chartCorners
    ? chartGridOrThrow(() => chartGridFromCorners(request.chartCorners as Point[]))
    : chartGridOrThrow(() => chartGridFromRegion(tuple(request.chartRegion!)));
  const leader = uploads.find((u) => u.role === 'leader');
  const bases: FilmBase[] = [];
  const measureBase = (image: RgbImage) =>
    bases.push(
      request.baseRegion
        ? baseFromRegion(image, scanner, tuple(request.baseRegion))
        : detectFilmBase(image, scanner),
    );

  const samples: { stops: number; sample: RegionSample }[] = [];
  for (const u of uploads.filter((f) => f.role === 'bracket')) {
    const image = await read(u);
    if (!image) continue;
    const own = request.bracket[u.index]!.greyRegion;
    const region = own ?? request.greyRegion;
    const wrong = regionErrors(region, image, own ? `${framePath(u)}.greyRegion` : 'greyRegion');
    if (wrong.length) {
      errors.push(...wrong.map((e) => ({ ...e, message: `${u.fileName}: ${e.message}` })));
      continue;
    }
    samples.push({
      stops: request.bracket[u.index]!.stops,
      sample: sampleRegion(image, scanner, tuple(region), { maxSamples: GREY_SAMPLE_PIXELS }),
    });
    if (!leader) measureBase(image);
  }

  const chartUpload = uploads.find((u) => u.role === 'chart')!;
  const chartImage = await read(chartUpload);
  let chart: RegionSample[] = [];
  if (chartImage) {
    const outside = grid.patches
      .flatMap((p) => p.cell)
      .some(([x, y]) => x < -0.5 || y < -0.5 || x > chartImage.width + 0.5 || y > chartImage.height + 0.5);
    if (outside)
      errors.push({
        path: request.chartCorners ? 'chartCorners' : 'chartRegion',
        message: `${chartUpload.fileName}: the chart's marks reach past the ${chartImage.width} × ${chartImage.height} frame`,
      });
    else chart = grid.patches.map((p) => sampleRegion(chartImage, scanner, p.sample));
    if (!leader) measureBase(chartImage);
  }

  if (leader) {
    const image = await read(leader);
    if (image) {
      const region = request.baseRegion ?? { x: 0, y: 0, width: image.width, height: image.height };
      const wrong = regionErrors(region, image, 'baseRegion');
      if (wrong.length) errors.push(...wrong);
      else bases.push(baseFromRegion(image, scanner, tuple(region)));
    }
  }

  if (errors.length)
    throw new AppError(
      'calibration-frames-invalid',
      422,
      `Some frames or marks cannot be used: ${errors.map((e) => e.message).join(' ')}`,
      errors,
    );

  const base = rollBase(bases);
  if (!(base.confidence > 0))
    throw new AppError(
      'no-film-base',
      422,
      'No usable film base was found: add a frame of unexposed leader, or mark a rebate with baseRegion.',
      [{ path: leader ? 'leader' : 'baseRegion', message: 'no unexposed film found' }],
    );

  let result: CalibrationResult;
  try {
    result = fitCalibration({
      base: base.rgb,
      brackets: samples,
      chart,
      stock: options.stock,
      reference: CHART_REFERENCE,
    });
  } catch (error) {
    if (error instanceof RangeError)
      throw new AppError(
        'calibration-not-fitted',
        422,
        `The calibration cannot be fitted: ${error.message}.`,
        [{ path: 'bracket', message: error.message }],
      );
    throw error;
  }
  const seconds = (performance.now() - started) / 1000;
  return {
    frames,
    result,
    grid,
    fit: describeFit(result, samples, base.rgb, leader ? 'leader' : 'frames', options.stock.iso, seconds),
    residuals: residualsOf(result),
    warnings: result.warnings.map((w) => ({ ...w })),
  };
}

function chartGridOrThrow(make: () => ChartGrid): ChartGrid {
  try {
    return make();
  } catch (error) {
    if (error instanceof RangeError)
      throw new AppError(
        'chart-marks-invalid',
        422,
        `The chart's marks do not make a grid: ${error.message}.`,
        [{ path: 'chartCorners', message: error.message }],
      );
    throw error;
  }
}

const round = (v: number, digits = 6) => Math.round(v * 10 ** digits) / 10 ** digits;
const finiteOrNull = (v: number) => (Number.isFinite(v) ? round(v) : null);

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
    chartExposureStops: r.chartExposureStops,
    deltaE: {
      patches: r.deltaE.patches.map((p) => ({
        index: p.index,
        name: p.name,
        reference: p.reference,
        after: p.measured ? p.after : null,
        deltaEBefore: finiteOrNull(p.deltaEBefore),
        deltaEAfter: finiteOrNull(p.deltaEAfter),
        inGamut: p.inGamut,
        measured: p.measured,
        referenceHex: labHex(p.reference),
        afterHex: p.measured ? labHex(p.after) : null,
      })),
      before: { mean: finiteOrNull(r.deltaE.before.mean), max: finiteOrNull(r.deltaE.before.max) },
      after: { mean: finiteOrNull(r.deltaE.after.mean), max: finiteOrNull(r.deltaE.after.max) },
    },
    base: { rgb: base, source: baseSource },
    usedFrames: r.usedFrames,
    seconds: round(seconds, 3),
  };
}

function residualsOf(r: CalibrationResult): CalibrationResiduals {
  const per = (c: CalibrationResult['curves'], pick: (f: CharacteristicCurveFit) => number) =>
    [pick(c.red), pick(c.green), pick(c.blue)].map((v) => round(v)) as Rgb;
  return {
    measuredCurves: per(r.measuredCurves, (f) => f.residualRms),
    profileCurves: per(r.curves, (f) => f.residualRms),
    straightParts: per(r.curves, (f) => f.straightPart.residualRms),
    crosstalk: r.crosstalk.residualRms.map((v) => round(v)) as Rgb,
  };
}
