import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import type { InvertChunkTask } from './invert-chunk';
import { sharePlan } from './share-plan';
import { createFrameBuffers, type FrameBuffers } from './frame-buffers';
import { bundleWorker } from './worker-bundle';

export interface InversionPoolOptions {
  /** Worker threads. Default `os.availableParallelism()`. */
  threads?: number;
  /** Slices per frame per thread; more slices even out uneven threads at a small cost per task. Default 2. */
  slicesPerThread?: number;
}

export interface InversionPool {
  readonly threads: number;
  /** Shared frame buffers to reuse from frame to frame (see `FrameBuffers` for why). */
  readonly buffers: FrameBuffers;
  /**
   * Inverts a whole frame across the workers. `input` and `output` must be backed by a
   * SharedArrayBuffer (see `sharedArray`) so the workers write the result in place, without copies.
   * Resolves when every pixel is written.
   *
   * With `bands`, the frame is inverted band after band of `bands.rows` rows (the last may be shorter), each
   * band shared among the workers, and `bands.done(index)` is called as soon as band `index` is written, so
   * the caller can encode it while later bands are inverted.
   */
  invertFrame(
    plan: InvertChunkTask['plan'],
    input: Uint16Array,
    output: InvertChunkTask['output'],
    width: number,
    height: number,
    bands?: FrameBands,
  ): Promise<void>;
  /** Stops the workers once running slices finish. */
  close(): Promise<void>;
}

/** How `invertFrame` reports a frame band by band. */
export interface FrameBands {
  /** Rows in every band but the last, at least 1. */
  rows: number;
  /** Called once per band, in any order, when all its rows are written. */
  done(index: number): void;
}

const WORKER_URL = new URL('./invert-chunk.ts', import.meta.url);

/**
 * Starts a pool of worker threads that invert frames slice by slice.
 *
 * The main thread compiles the plan once (`compileInversion`); its tables are moved onto shared
 * memory once per frame, and each slice task carries views of them and of the shared input and
 * output buffers, so nothing large is copied per slice. The workers start once, from a bundled
 * plain-JavaScript copy of the worker (see `bundleWorker`), and live across frames.
 *
 * @example
 *   const pool = createInversionPool({ threads: 2 });
 *   await pool.invertFrame(plan, negative.data, output, negative.width, negative.height);
 *   await pool.close();
 */
export function createInversionPool(options: InversionPoolOptions = {}): InversionPool {
  const threads = options.threads ?? availableParallelism();
  const slicesPerThread = options.slicesPerThread ?? 2;
  if (!Number.isInteger(threads) || threads < 1 || threads > 256) {
    throw new TypeError(
      `Expected integer between 1 and 256 for threads but received ${threads} of type ${typeof threads}`,
    );
  }
  if (!Number.isInteger(slicesPerThread) || slicesPerThread < 1 || slicesPerThread > 64) {
    throw new TypeError(
      `Expected integer between 1 and 64 for slicesPerThread but received ${slicesPerThread} of type ${typeof slicesPerThread}`,
    );
  }
  // Workers run the bundled plain-JavaScript worker: no TypeScript loader per thread (seconds at start-up).
  const worker = bundleWorker(WORKER_URL);
  const piscina = new Piscina<InvertChunkTask, number>({
    filename: worker.href,
    minThreads: threads,
    maxThreads: threads,
    // Frames of a roll arrive back to back; keep the workers warm between them.
    idleTimeout: 60_000,
    // Plain JavaScript: none of the parent's loader flags (tsx, vitest) are needed or wanted in the workers.
    execArgv: [],
  });

  return {
    threads,
    buffers: createFrameBuffers(),
    async invertFrame(plan, input, output, width, height, bands) {
      const pixels = width * height;
      if (input.length < pixels * 3 || output.length < pixels * 3) {
        throw new TypeError(
          `Expected at least ${pixels * 3} samples for input and output but received ${input.length} and ${output.length}`,
        );
      }
      if (!(input.buffer instanceof SharedArrayBuffer) || !(output.buffer instanceof SharedArrayBuffer)) {
        throw new TypeError('Expected input and output backed by a SharedArrayBuffer');
      }
      if (bands && (!Number.isInteger(bands.rows) || bands.rows < 1)) {
        throw new TypeError(
          `Expected positive integer for bands.rows but received ${bands.rows} of type ${typeof bands.rows}`,
        );
      }
      const shared = sharePlan(plan);
      const slice = (row: number, rows: number) =>
        piscina.run({
          plan: shared,
          input,
          output,
          firstPixel: row * width,
          pixelCount: rows * width,
        } satisfies InvertChunkTask);
      // Slices are queued in row order and the workers take them in that order, so bands finish top to bottom.
      const slicesOf = (firstRow: number, rows: number, count: number) => {
        const tasks: Promise<number>[] = [];
        const rowsPerSlice = Math.ceil(rows / Math.min(rows, count));
        for (let row = firstRow; row < firstRow + rows; row += rowsPerSlice)
          tasks.push(slice(row, Math.min(rowsPerSlice, firstRow + rows - row)));
        return Promise.all(tasks);
      };
      if (!bands) {
        await slicesOf(0, height, threads * slicesPerThread);
        return;
      }
      const tasks: Promise<void>[] = [];
      for (let index = 0, row = 0; row < height; index++, row += bands.rows) {
        const rows = Math.min(bands.rows, height - row);
        tasks.push(slicesOf(row, rows, threads).then(() => bands.done(index)));
      }
      await Promise.all(tasks);
    },
    async close() {
      await piscina.close();
    },
  };
}

/** A zeroed typed array of `length` elements on a SharedArrayBuffer, for `invertFrame`. */
export function sharedArray(kind: Uint8ArrayConstructor, length: number): Uint8Array;
export function sharedArray(kind: Uint16ArrayConstructor, length: number): Uint16Array;
export function sharedArray(
  kind: Uint8ArrayConstructor | Uint16ArrayConstructor,
  length: number,
): Uint8Array | Uint16Array;
export function sharedArray(
  kind: Uint8ArrayConstructor | Uint16ArrayConstructor,
  length: number,
): Uint8Array | Uint16Array {
  const buffer = new SharedArrayBuffer(length * kind.BYTES_PER_ELEMENT);
  return kind === Uint8Array ? new Uint8Array(buffer) : new Uint16Array(buffer);
}
