import { Piscina } from 'piscina';
import { bundleWorker } from '../inversion-pool/worker-bundle';
import type { ReferenceNegative } from './reference-negative';
import type { ReferenceNegativeTask } from './reference-negative-task';

const TASK_URL = new URL('./reference-negative-task.ts', import.meta.url);
// One thread is enough: a film's negative is made once per process and kept; a second thread would only compete
// with the inversion pool for the same cores (our choice).
const threads = 1;
// An idle thread ends after this long, so a server that has made its negatives holds no thread for them (our choice).
const idleMs = 5_000;

let pool: Piscina<ReferenceNegativeTask, ReferenceNegative> | undefined;

/**
 * Makes a film's reference negative on a worker thread, so the server's event loop keeps answering while the
 * forward model runs. The thread starts from a bundled plain-JavaScript copy of the task (see `bundleWorker`) on
 * first use and ends when idle.
 *
 * Rejects with the worker's error when the negative cannot be made.
 * @example const negative = await generateReferenceNegative({ stock: stockRow, crosstalk }, { width: 1500, height: 1000 });
 */
export function generateReferenceNegative(
  film: ReferenceNegativeTask['film'],
  size: ReferenceNegativeTask['size'],
): Promise<ReferenceNegative> {
  pool ??= new Piscina<ReferenceNegativeTask, ReferenceNegative>({
    filename: bundleWorker(TASK_URL).href,
    minThreads: 0,
    maxThreads: threads,
    idleTimeout: idleMs,
    // plain JavaScript: none of the parent's loader flags (tsx, vitest) are needed in the worker
    execArgv: [],
  });
  // only what the negative depends on crosses to the thread (a stock row has more)
  const { name, iso, masked, base_material } = film.stock;
  return pool.run({ film: { stock: { name, iso, masked, base_material }, crosstalk: film.crosstalk }, size });
}
