import type { MeasuredBase, ScannerProfile } from '@clearbase/contracts';
import { baseBlockLayout } from '@clearbase/inversion';
import { readNegativeHeader, sampleNegative, type NegativeHeader } from '../imaging/index';
import { measureSampledBase } from './measure-sampled-base';
import type { ValidationBudget } from './validation-budget';

/** A scan judged usable: its header, and its film base where one was found. */
export interface ValidatedNegative {
  header: NegativeHeader;
  /** Null when no base was found: a QC matter for the render, not a reason to refuse the scan. */
  base: MeasuredBase | null;
}

/**
 * The coarsest sampling that still touches every tile of a tiled TIFF (tiles are multiples of 16 pixels each way,
 * TIFF 6.0 section 15), so a damaged tile anywhere fails the decode.
 */
export const MAX_SAMPLE_STEP = 16;

/**
 * Validates an uploaded negative scan without holding its frame: the header is judged first (size, depth, colour;
 * nothing decoded), then, within `budget`, the pixels are decoded strip by strip to the end of the file at the
 * spacing base detection samples them (`sampleNegative`, at most every 16th pixel), and the film base is detected on
 * that sample. The budget is charged the frame's decoded bytes (width × height × channels × bytes a sample): what the
 * decoder holds for an interlaced PNG, which libvips decodes whole, so the bound holds whatever the file's layout;
 * most files hold far less (see sample-negative.ts).
 *
 * Throws `ImageInputError` as `readNegativeHeader` and `sampleNegative` do (`too-many-pixels` before any decode and
 * without waiting for the budget, `truncated` for pixels that do not decode...).
 *
 * @example
 * const { header, base } = await validateNegative(upload.path, { maxPixels, budget, scanner });
 */
export async function validateNegative(
  path: string,
  options: { maxPixels: number; budget: ValidationBudget; scanner: ScannerProfile },
): Promise<ValidatedNegative> {
  const header = await readNegativeHeader(path, { maxPixels: options.maxPixels });
  const { width, height, channels, bitDepth } = header;
  return options.budget.run(width * height * channels * (bitDepth / 8), async () => {
    const { size, step } = baseBlockLayout(header);
    const sample = await sampleNegative(path, header, Math.min(MAX_SAMPLE_STEP, step));
    let base: MeasuredBase | null = null;
    try {
      base = measureSampledBase(sample, size, options.scanner);
    } catch {
      // no base found is a QC matter for the render, not a reason to refuse the scan
    }
    return { header, base };
  });
}
