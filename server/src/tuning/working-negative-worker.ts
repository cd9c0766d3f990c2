import type { FrameLevels } from '@clearbase/inversion';
import type { MeasuredBase } from '@clearbase/contracts';
import { Piscina } from 'piscina';
import { bundleWorker } from '../inversion-pool/worker-bundle';
import type {
  MadeWorkingNegative,
  MakeWorkingNegativeTask,
  MeasureBaseTask,
  MeasureLevelsTask,
  WorkingNegativeResult,
  WorkingNegativeTask,
} from './working-negative-task';

const TASK_URL = new URL('./working-negative-task.ts', import.meta.url);
// One thread: a working negative is made once per frame and then read from the store; a second thread would only
// compete with the inversion pool for the same cores (our choice).
const threads = 1;
// An idle thread ends after this long, so a server nobody tunes on holds no thread for it (our choice).
const idleMs = 10_000;

let pool: Piscina<WorkingNegativeTask, WorkingNegativeResult> | undefined;

function workingNegativePool() {
  pool ??= new Piscina<WorkingNegativeTask, WorkingNegativeResult>({
    filename: bundleWorker(TASK_URL).href,
    minThreads: 0,
    maxThreads: threads,
    idleTimeout: idleMs,
    // plain JavaScript: none of the parent's loader flags (tsx, vitest) are needed in the worker
    execArgv: [],
  });
  return pool;
}

/** The buffer of pixels that own a whole plain ArrayBuffer, which can be moved to the thread instead of copied. */
function movable(data: Uint16Array): ArrayBuffer[] | undefined {
  return data.buffer instanceof ArrayBuffer &&
    data.byteOffset === 0 &&
    data.byteLength === data.buffer.byteLength
    ? [data.buffer]
    : undefined;
}

/**
 * Reduces a decoded scan to its working negative and takes its level sample, on the worker thread. The scan's
 * pixels are moved there when they own their buffer (its `data` is empty afterwards).
 * @example const { working, sample } = await makeWorkingNegativeOffThread({ kind: 'make', image, longEdge: 1500 });
 */
export async function makeWorkingNegativeOffThread(
  task: MakeWorkingNegativeTask,
): Promise<MadeWorkingNegative> {
  return (await workingNegativePool().run(task, {
    transferList: movable(task.image.data),
  })) as MadeWorkingNegative;
}

/**
 * The full scan's levels from its level sample, measured on the worker thread.
 * @example const levels = await measureLevelsOffThread({ kind: 'levels', sample, profile, scanner, base: [0.8, 0.7, 0.6] });
 */
export async function measureLevelsOffThread(task: MeasureLevelsTask): Promise<FrameLevels> {
  return (await workingNegativePool().run(task)) as FrameLevels;
}

/**
 * A decoded scan's film base, measured on the worker thread (the scan's pixels are moved there when they can be).
 * Rejects with the library's error when no base can be found.
 * @example const base = await measureBaseOffThread({ kind: 'base', image, scanner, region: null });
 */
export async function measureBaseOffThread(task: MeasureBaseTask): Promise<MeasuredBase> {
  return (await workingNegativePool().run(task, { transferList: movable(task.image.data) })) as MeasuredBase;
}
