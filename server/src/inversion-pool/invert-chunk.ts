import { applyInversion } from './inversion-kernel';

/** One slice of a frame for a worker: pixels [firstPixel, firstPixel + pixelCount) of shared buffers. */
export interface InvertChunkTask {
  plan: Parameters<typeof applyInversion>[0];
  input: Uint16Array;
  output: Parameters<typeof applyInversion>[2];
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
