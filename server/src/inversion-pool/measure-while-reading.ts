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

/** What a frame's measurement takes from its rows as they are copied in, and what it gives once all are in. */
export interface MeasureWhileReading {
  /** For `readNegative`'s `onRows`: looks at the rows now in place, while they are still in cache. */
  onRows(frame: RgbImage, endRow: number): void;
  /** `detectFilmBase` of the frame (when detection was asked for); throws a RangeError before every row is in. */
  base(): FilmBase;
  /** `levelSample` of the frame: measured with `{ step: 1 }`, the frame's own levels. Throws before every row is in. */
  levelSample(): RgbImage;
}

/**
 * Measures a frame while its pixels are copied in (see `readNegative`'s `onRows`): base detection examines each
 * row of blocks as soon as its rows are in place, and the levels' strided sample is taken band by band. Afterwards
 * the frame's strided pixels would be read from main memory, a cache miss each (about half of what base and
 * levels cost at 24 MP); here they are still in cache. Gives the same base and the same levels as measuring the
 * whole frame afterwards (tested).
 * @example
 *   const m = measureWhileReading(scanner, { detectBase: true, sampleLevels: true });
 *   await readNegative(file, { allocate, onRows: m.onRows });
 *   m.base();
 */
export function measureWhileReading(
  scanner: ScannerProfile,
  { detectBase, sampleLevels }: { detectBase: boolean; sampleLevels: boolean },
): MeasureWhileReading {
  const blocks: BaseBlock[] = [];
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
      if (ready > examinedRows) blocks.push(...examineBaseBlocks(frame, scanner, {}, examinedRows, ready));
      examinedRows = Math.max(examinedRows, ready);
    },
    base() {
      if (!detectBase || blockRows < 0 || examinedRows < blockRows)
        throw new RangeError('Expected every row of blocks examined before the base is asked for');
      return baseFromBlocks(blocks);
    },
    levelSample() {
      if (!sampler) throw new RangeError('Expected a level sample asked for and the frame read');
      return sampler.sample();
    },
  };
}
