import { Piscina } from 'piscina';
import { bundleWorker } from '../inversion-pool/worker-bundle';
import type {
  CalibrationTask,
  FitRollTask,
  FittedRoll,
  MeasuredFrame,
  MeasureFrameTask,
} from './calibration-task';

const TASK_URL = new URL('./calibration-task.ts', import.meta.url);
// One thread: a roll's frames are measured one after another, and calibrations are rare; a second thread would only
// compete with the inversion pool for the same cores (our choice).
const threads = 1;
// An idle thread ends after this long, so a server between calibrations holds no thread for them (our choice).
const idleMs = 5_000;

let pool: Piscina<CalibrationTask, MeasuredFrame | FittedRoll> | undefined;

function calibrationPool() {
  pool ??= new Piscina<CalibrationTask, MeasuredFrame | FittedRoll>({
    filename: bundleWorker(TASK_URL).href,
    minThreads: 0,
    maxThreads: threads,
    idleTimeout: idleMs,
    // plain JavaScript: none of the parent's loader flags (tsx, vitest) are needed in the worker
    execArgv: [],
  });
  return pool;
}

/**
 * Samples a decoded frame's areas (and its base when asked) on the calibration worker thread, so the server keeps
 * answering meanwhile. A frame whose pixels own a whole plain ArrayBuffer is moved to the thread, not copied: its
 * `data` is empty afterwards. The thread starts from a bundled copy of `calibration-task.ts` on first use and ends
 * when idle.
 *
 * Rejects with the worker's error for bad areas or options.
 * @example const { samples, base } = await measureCalibrationFrame({ kind: 'measure', image, scanner, areas, base: 'detect' });
 */
export async function measureCalibrationFrame(task: MeasureFrameTask): Promise<MeasuredFrame> {
  const { data } = task.image;
  const movable =
    data.buffer instanceof ArrayBuffer && data.byteOffset === 0 && data.byteLength === data.buffer.byteLength;
  return (await calibrationPool().run(task, {
    transferList: movable ? [data.buffer] : undefined,
  })) as MeasuredFrame;
}

/**
 * Fits a roll's measurements on the calibration worker thread and answers the fit in its stored form.
 * Resolves `{ ok: false, reason }` for a roll the library cannot fit (too few usable grey frames).
 * @example const fitted = await fitCalibrationRollMeasurements({ kind: 'fit', measurements, baseSource: 'leader' });
 */
export async function fitCalibrationRollMeasurements(task: FitRollTask): Promise<FittedRoll> {
  return (await calibrationPool().run(task)) as FittedRoll;
}
