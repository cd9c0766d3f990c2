import type {
  CalibrationFit,
  CalibrationResiduals,
  CalibrationWarning,
  ProfileDocument,
  ScannerProfile,
} from '@clearbase/contracts';
import {
  baseFromRegion,
  CHART_REFERENCE,
  detectFilmBase,
  fitCalibration,
  sampleRegion,
  type CalibrationMeasurements,
  type FilmBase,
  type Point,
  type Region,
  type RegionSample,
  type RgbImage,
} from '@clearbase/inversion';
import { describeFit, residualsOf } from './describe-fit';

/** One area to sample on a frame: a rectangle or a chart patch's polygon, at most `maxSamples` pixels read. */
export interface CalibrationArea {
  area: Region | readonly Point[];
  maxSamples?: number;
}

/**
 * Measure one decoded frame: sample its areas and, when asked, its film base (`'detect'` searches the whole frame,
 * a rectangle takes the base from there, `null` measures none).
 */
export interface MeasureFrameTask {
  kind: 'measure';
  image: RgbImage;
  scanner: ScannerProfile;
  areas: CalibrationArea[];
  base: 'detect' | Region | null;
}

/** What a frame measured: one sample per area, in order, and its base when asked. */
export interface MeasuredFrame {
  samples: RegionSample[];
  base: FilmBase | null;
}

/** Fit the roll's measurements against the published chart and describe the fit in its stored form. */
export interface FitRollTask {
  kind: 'fit';
  measurements: Omit<CalibrationMeasurements, 'reference'>;
  baseSource: 'leader' | 'frames';
}

/**
 * The stored form of a fit, every field plain data (the library's curves are functions and stay in the worker);
 * `seconds` is filled in by the caller. A roll the library cannot fit answers `{ ok: false }` with its reason.
 */
export type FittedRoll =
  | {
      ok: true;
      fit: Omit<CalibrationFit, 'seconds'>;
      residuals: CalibrationResiduals;
      warnings: CalibrationWarning[];
      profileDocument: ProfileDocument;
    }
  | { ok: false; reason: string };

export type CalibrationTask = MeasureFrameTask | FitRollTask;

/**
 * Worker-thread entry: the CPU-bound parts of a calibration (base detection, region sampling, the fit) off the
 * server's event loop. Run through `measureCalibrationFrame` and `fitCalibrationRollMeasurements`, not directly.
 * @example await piscina.run({ kind: 'measure', image, scanner, areas: [{ area: [8, 8, 16, 16] }], base: null })
 */
export default function calibrationTask(task: CalibrationTask): MeasuredFrame | FittedRoll {
  return task.kind === 'measure' ? measureFrame(task) : fitRoll(task);
}

function measureFrame(task: MeasureFrameTask): MeasuredFrame {
  const { image, scanner } = task;
  const samples = task.areas.map((a) =>
    sampleRegion(image, scanner, a.area, a.maxSamples ? { maxSamples: a.maxSamples } : {}),
  );
  const base =
    task.base === null
      ? null
      : task.base === 'detect'
        ? detectFilmBase(image, scanner)
        : baseFromRegion(image, scanner, task.base);
  return { samples, base };
}

function fitRoll(task: FitRollTask): FittedRoll {
  const m = task.measurements;
  try {
    const result = fitCalibration({ ...m, reference: CHART_REFERENCE });
    const fit = describeFit(result, m.brackets, m.base, task.baseSource, m.stock.iso, 0);
    const { seconds: _seconds, ...plain } = fit;
    return {
      ok: true,
      fit: plain,
      residuals: residualsOf(result),
      warnings: result.warnings.map((w) => ({ ...w })),
      profileDocument: result.profileDocument,
    };
  } catch (error) {
    if (error instanceof RangeError) return { ok: false, reason: error.message };
    throw error;
  }
}
