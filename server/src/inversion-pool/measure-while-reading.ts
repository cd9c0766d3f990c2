import type { ScannerProfile } from '@clearbase/contracts';
import {
  baseBlockLayout,
  baseFromBlocks,
  examineBaseBlocks,
  levelSampler,
  type BaseBlock,
  type FilmBase,
  type LevelSampler,
  type RgbImage,
} from '@clearbase/inversion';
import type { InversionPool } from './inversion-pool';

/** What a frame's measurement takes from its rows as they are copied in, and what it gives once all are in. */
export interface MeasureWhileReading {
  /** For `readNegative`'s `onRows`: looks at the rows now in place, while they are still in cache. */
  onRows(frame: RgbImage, endRow: number): void;
  /**
   * `detectFilmBase` of the frame (when detection was asked for). Rejects with a RangeError before every row is in,
   * and with a worker's error if one failed.
   */
  base(): Promise<FilmBase>;
  /** `levelSample` of the frame: measured with `{ step: 1 }`, the frame's own levels. Throws before every row is in. */
  levelSample(): RgbImage;
}

export interface MeasureWhileReadingOptions {
  detectBase: boolean;
  sampleLevels: boolean;
  /**
   * Examines rows of blocks on the pool's workers, beside the copy, when the frame is on a SharedArrayBuffer (as
   * `readPooledNegative`'s are); on the calling thread, during the copy, otherwise.
   */
  pool?: InversionPool;
}

/**
 * Measures a frame while its pixels are copied in (see `readNegative`'s `onRows`): base detection examines each
 * row of blocks as soon as its rows are in place, and the levels' strided sample is taken band by band. Afterwards
 * the frame's strided pixels would be read from main memory, a cache miss each (about half of what base and
 * levels cost at 24 MP); here they are still in cache. Gives the same base and the same levels as measuring the
 * whole frame afterwards (tested).
 * @example
 *   const m = measureWhileReading(scanner, { detectBase: true, sampleLevels: true, pool });
 *   await readNegative(file, { allocate, onRows: m.onRows });
 *   await m.base();
 */
export function measureWhileReading(
  scanner: ScannerProfile,
  { detectBase, sampleLevels, pool }: MeasureWhileReadingOptions,
): MeasureWhileReading {
  const parts: (BaseBlock[] | Promise<BaseBlock[]>)[] = [];
  let examinedRows = 0,
    blockRows = -1,
    sampler: LevelSampler | null = null;
  return {
    onRows(frame, endRow) {
      if (sampleLevels) {
        sampler ??= levelSampler(frame);
        sampler.take(frame.data, endRow);
      }
      if (!detectBase) return;
      const layout = baseBlockLayout(frame);
      blockRows = layout.blockRows;
      const ready = Math.min(blockRows, Math.floor(endRow / layout.size));
      if (ready <= examinedRows) return;
      const part =
        pool && frame.data.buffer instanceof SharedArrayBuffer
          ? pool.examineBaseBlocks(frame, scanner, examinedRows, ready)
          : examineBaseBlocks(frame, scanner, {}, examinedRows, ready);
      // Awaited in base(); marked handled now, so a worker's failure while the copy goes on is not reported twice.
      if (part instanceof Promise) part.catch(() => undefined);
      parts.push(part);
      examinedRows = ready;
    },
    async base() {
      if (!detectBase || blockRows < 0 || examinedRows < blockRows)
        throw new RangeError('Expected every row of blocks examined before the base is asked for');
      return baseFromBlocks((await Promise.all(parts)).flat());
    },
    levelSample() {
      if (!sampler) throw new RangeError('Expected a level sample asked for and the frame read');
      return sampler.sample();
    },
  };
}
