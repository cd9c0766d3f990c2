import type { StockRow } from '../db/database';
import { makeReferenceNegative, type ReferenceNegative } from './demo-reference-frames';

/** What a worker thread is asked to make: a stock's reference negative at a size. */
export interface ReferenceNegativeTask {
  stock: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'>;
  size: { width: number; height: number };
}

/**
 * Worker-thread entry: makes a reference negative off the server's event loop (the forward model takes seconds on
 * 1.5 megapixels). Run through `generateReferenceNegative`, not directly.
 * @example await piscina.run({ stock, size: { width: 150, height: 100 } }) // a ReferenceNegative
 */
export default function referenceNegativeTask(task: ReferenceNegativeTask): ReferenceNegative {
  return makeReferenceNegative(task.stock, task.size);
}
