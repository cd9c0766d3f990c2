import type { InversionPlan } from '@clearbase/inversion';
// The modules the workers need, not the library's index: the worker is bundled (see worker-bundle.ts),
// and the index would bring in the colour-difference library and the forward model for nothing.
import { applyInversion } from '../../../libs/inversion/src/compile-inversion';

/** One slice of a frame for a worker: pixels [firstPixel, firstPixel + pixelCount) of shared buffers. */
export interface InvertChunkTask {
  plan: InversionPlan;
  input: Uint16Array;
  output: Uint8Array | Uint16Array;
  firstPixel: number;
  pixelCount: number;
}

/**
 * Worker entry: inverts one slice in place in the shared output buffer and returns nothing, so
 * no pixels travel back through postMessage.
 */
export default function invertChunk(task: InvertChunkTask): number {
  applyInversion(task.plan, task.input, task.output, task.firstPixel, task.pixelCount);
  return task.pixelCount;
}
