import type {
  CalibrationFit,
  CalibrationResiduals,
  CalibrationWarning,
  CreateCalibrationRequest,
  PixelRegion,
  ProfileDocument,
  ScannerProfile,
} from '@clearbase/contracts';
import {
  chartGridFromCorners,
  chartGridFromRegion,
  rollBase,
  type CalibrationStock,
  type ChartGrid,
  type FilmBase,
  type Point,
  type Region,
  type RegionSample,
} from '@clearbase/inversion';
import type { FieldError } from '../errors/app-error';
import { AppError } from '../errors/app-error';
import { ImageInputError, readNegative, type NegativeImage } from '../imaging/index';
import { fitCalibrationRollMeasurements, measureCalibrationFrame } from './calibration-worker';
import { movablePixels } from './movable-pixels';

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
  /** The draft profile the fit makes. */
  profileDocument: ProfileDocument;
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
 * fits it with `fitCalibration`. Decoding is the image library's own (off the event loop); the sampling, base
 * detection and fit run on the calibration worker thread (`calibration-worker.ts`), so the server keeps answering
 * other requests throughout. Every unreadable frame and every mark outside its frame is gathered into one 422
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
      // counts of their own, copied a step at a time, so they move to the worker thread without blocking
      return { ...image, data: await movablePixels(image.data) };
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
  // Without a leader, every grey and chart frame gives a base: from the marked rebate, or found on the frame.
  const frameBase = leader ? null : request.baseRegion ? tuple(request.baseRegion) : ('detect' as const);
  const keepBase = (base: FilmBase | null) => {
    if (base) bases.push(base);
  };

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
    const measured = await measureCalibrationFrame({
      kind: 'measure',
      image,
      scanner,
      areas: [{ area: tuple(region), maxSamples: GREY_SAMPLE_PIXELS }],
      base: frameBase,
    });
    samples.push({ stops: request.bracket[u.index]!.stops, sample: measured.samples[0]! });
    keepBase(measured.base);
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
    else {
      const measured = await measureCalibrationFrame({
        kind: 'measure',
        image: chartImage,
        scanner,
        areas: grid.patches.map((p) => ({ area: p.sample })),
        base: frameBase,
      });
      chart = measured.samples;
      keepBase(measured.base);
    }
  }

  if (leader) {
    const image = await read(leader);
    if (image) {
      const region = request.baseRegion ?? { x: 0, y: 0, width: image.width, height: image.height };
      const wrong = regionErrors(region, image, 'baseRegion');
      if (wrong.length) errors.push(...wrong);
      else
        keepBase(
          (await measureCalibrationFrame({ kind: 'measure', image, scanner, areas: [], base: tuple(region) }))
            .base,
        );
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

  const baseSource = leader ? 'leader' : 'frames';
  const fitted = await fitCalibrationRollMeasurements({
    kind: 'fit',
    measurements: { base: base.rgb, brackets: samples, chart, stock: options.stock },
    baseSource,
  });
  if (!fitted.ok)
    throw new AppError('calibration-not-fitted', 422, `The calibration cannot be fitted: ${fitted.reason}.`, [
      { path: 'bracket', message: fitted.reason },
    ]);
  const seconds = (performance.now() - started) / 1000;
  return {
    frames,
    profileDocument: fitted.profileDocument,
    grid,
    fit: { ...fitted.fit, seconds: Math.round(seconds * 1000) / 1000 },
    residuals: fitted.residuals,
    warnings: fitted.warnings,
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
