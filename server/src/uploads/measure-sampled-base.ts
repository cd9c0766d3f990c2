import type { MeasuredBase, ScannerProfile } from '@clearbase/contracts';
import { detectFilmBase } from '@clearbase/inversion';
import { toMeasuredBase } from '../film-base/measured-base';
import type { NegativeSample } from '../imaging/index';

/**
 * Detects the film base on a sample of a frame (`sampleNegative`), with blocks of the size detection would use on the
 * whole frame (`blockSize`, full-frame pixels), and gives it in the frame's pixels. At step 1 the sample is the frame
 * and the base is the one `measureNegativeBase` finds; at larger steps detection sees the same pixels it would
 * sample on the frame, at about the same spacing. Throws what detection throws.
 *
 * @example
 * const { size } = baseBlockLayout(header);
 * const base = measureSampledBase(await sampleNegative(path, header, step), size, scanner);
 */
export function measureSampledBase(
  sample: NegativeSample,
  blockSize: number,
  scanner: ScannerProfile,
): MeasuredBase {
  const { step } = sample;
  const base = detectFilmBase(sample, scanner, { blockSize: Math.max(1, Math.floor(blockSize / step)) });
  const [x, y, width, height] = base.region;
  return toMeasuredBase({ ...base, region: [x * step, y * step, width * step, height * step] });
}
