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

/**
 * Decodes a negative whose header `readNegativeHeader` judged usable, keeping every `step`-th pixel each way (nearest
 * neighbour, no averaging), without ever holding the whole frame: libvips reads the file strip by strip in order
 * (`sequentialRead`) and hands over every row at every `step`-th column, of which every `step`-th row is kept. Every
 * row of the file is decoded, so a damaged strip anywhere, or a file cut off at its end, fails the read. In a tiled
 * file every tile is decoded while `step` is at most 16 (tiles are multiples of 16 pixels each way, TIFF 6.0 section
 * 15), save perhaps a right-hand column of tiles narrower than half a step. Memory is the decoder's strip or tile
 * buffer and the rows at every `step`-th column (height × width × 6 / step bytes), not the frame. libvips reads even a
 * TIFF with all its rows in one strip a part at a time (10950 × 10950 at 16 bits in one deflate strip: 165 MB peak
 * RSS, against 719 MB decoded), but it decodes an interlaced PNG whole (6000 × 6000: 311 MB against 122 MB for the
 * same image not interlaced).
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
  const decoder = sharp(path, {
    limitInputPixels: width * height,
    failOn: 'error',
    ignoreIcc: true,
    sequentialRead: true,
  })
    .removeAlpha()
    .toColourspace(bitDepth === 16 ? 'rgb16' : 'srgb');
  const columns = Math.floor(width / step);
  // Every row at every step-th column: the rows come out whole, so none of the file's is left undecoded.
  const pipeline =
    step === 1
      ? decoder
      : decoder.resize({ width: columns, height, kernel: 'nearest', fit: 'fill', fastShrinkOnLoad: false });
  let pixels: Buffer;
  try {
    const { data, info } = await pipeline
      .raw({ depth: bitDepth === 16 ? 'ushort' : 'uchar' })
      .toBuffer({ resolveWithObject: true });
    if (info.channels !== 3 || info.width !== columns || info.height !== height) {
      throw new Error(`decoded ${info.width}x${info.height}x${info.channels}`);
    }
    pixels = data;
  } catch (cause) {
    throw damagedImageError(format, cause);
  }
  const rows = Math.floor(height / step);
  const rowSamples = columns * 3;
  const data = new Uint16Array(rows * rowSamples);
  if (bitDepth === 16) {
    const bytes = new Uint8Array(data.buffer);
    for (let j = 0; j < rows; j++) {
      const from = j * step * rowSamples * 2;
      bytes.set(pixels.subarray(from, from + rowSamples * 2), j * rowSamples * 2);
    }
  } else {
    for (let j = 0; j < rows; j++) {
      const from = j * step * rowSamples;
      for (let i = 0; i < rowSamples; i++) data[j * rowSamples + i] = pixels[from + i]! * 257;
    }
  }
  return { width: columns, height: rows, data, step };
}
