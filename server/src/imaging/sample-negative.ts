import sharp from 'sharp';
import { damagedImageError } from './damaged-image-error';
import type { NegativeHeader } from './read-negative-header';

/** A negative read at every `step`-th pixel each way: what base detection needs, a small part of the frame. */
export interface NegativeSample {
  width: number;
  height: number;
  /** width × height × 3 scanner counts at 16-bit full scale, RGB interleaved (an 8-bit file scaled by 257). */
  data: Uint16Array;
  /** Pixels of the file between two sampled ones, each way (1: every pixel). */
  step: number;
}

/** Rows at the foot of the image decoded again to make sure the file decodes to its end: two sample rows. */
const TAIL_STEPS = 2;

/**
 * Decodes a negative whose header `readNegativeHeader` judged usable, keeping every `step`-th pixel each way (nearest
 * neighbour, no averaging), without ever holding the whole frame: libvips reads the file strip by strip in order
 * (`sequentialRead`), decoding every row on its way to the next sampled one, so a damaged strip anywhere fails the
 * read. The rows below the last sampled one are decoded in a second sequential pass that keeps only the last
 * `2 × step` rows, so a file cut off at its end fails too. In a tiled file every tile is touched while `step` is at
 * most 16 (tiles are multiples of 16 pixels each way), save a right-hand column of tiles narrower than half a step,
 * which only the second pass decodes, in its rows. Memory is the decoder's strip or tile buffer and the
 * sample (width × height × 6 / step² bytes), not the frame; a file whose pixels sit in one strip (or an interlaced
 * PNG) still makes the decoder hold that strip.
 *
 * `step` is an integer from 1 (every pixel: the whole frame) to the shorter side. Throws a RangeError for a bad step
 * and `ImageInputError` with code `truncated` when the pixels do not decode.
 *
 * @example
 *   const header = await readNegativeHeader(path, { maxPixels });
 *   const sample = await sampleNegative(path, header, 16); // 1/256 of the pixels
 */
export async function sampleNegative(
  path: string,
  header: NegativeHeader,
  step: number,
): Promise<NegativeSample> {
  const { width, height, bitDepth, format } = header;
  if (!Number.isInteger(step) || step < 1 || step > Math.min(width, height)) {
    throw new RangeError(
      `Expected integer between 1 and ${Math.min(width, height)} for step but received ${step} of type ${typeof step}`,
    );
  }
  const decoder = () =>
    sharp(path, { limitInputPixels: width * height, failOn: 'error', ignoreIcc: true, sequentialRead: true })
      .removeAlpha()
      .toColourspace(bitDepth === 16 ? 'rgb16' : 'srgb');
  const depth = bitDepth === 16 ? 'ushort' : 'uchar';
  const sampled = { width: Math.floor(width / step), height: Math.floor(height / step) };
  let pixels: Buffer;
  try {
    const pipeline =
      step === 1
        ? decoder()
        : decoder().resize({ ...sampled, kernel: 'nearest', fit: 'fill', fastShrinkOnLoad: false });
    const { data, info } = await pipeline.raw({ depth }).toBuffer({ resolveWithObject: true });
    if (info.channels !== 3 || info.width !== sampled.width || info.height !== sampled.height) {
      throw new Error(`decoded ${info.width}x${info.height}x${info.channels}`);
    }
    pixels = data;
    if (step > 1) {
      const rows = Math.min(height, TAIL_STEPS * step);
      await decoder()
        .extract({ left: 0, top: height - rows, width, height: rows })
        .raw({ depth })
        .toBuffer();
    }
  } catch (cause) {
    throw damagedImageError(format, cause);
  }
  const samples = sampled.width * sampled.height * 3;
  const data = new Uint16Array(samples);
  if (bitDepth === 16) new Uint8Array(data.buffer).set(pixels.subarray(0, samples * 2));
  else for (let i = 0; i < samples; i++) data[i] = pixels[i]! * 257;
  return { ...sampled, data, step };
}
