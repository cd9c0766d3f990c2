import sharp from 'sharp';
import type { OutputInfo } from 'sharp';
import { damagedImageError } from './damaged-image-error';
import { readImageHead } from './read-image-head';
import { readNegativeHeader } from './read-negative-header';
import type { SniffedFormat } from './sniff-format';
import {
  SPOOL_MIN_FREE_BYTES,
  spoolDir,
  spoolHasRoom,
  startSpooledDecode,
  type SpooledDecode,
} from './spooled-decode';

// A 6x7 cm frame scanned at 4000 ppi is about 9500 x 11000 = 105 MP; common practice of the trade, from memory.
export const DEFAULT_MAX_PIXELS = 120_000_000;

export interface ReadNegativeOptions {
  /** Largest width × height accepted, checked from the header before any pixel is decoded. Default 120 000 000. */
  maxPixels?: number;
  /** Put the pixels in a SharedArrayBuffer so worker threads can read them without a copy. Default false. */
  shared?: boolean;
  /** Supplies the array the pixels are copied into (for example a reused shared buffer); overrides `shared`. */
  allocate?: (samples: number) => Uint16Array;
  /**
   * Called as the pixels land in the frame's array, band by band of about a megabyte, with the frame (its `data` that
   * array) and how many of its rows are in place: work on a band's rows now finds them in cache. Not called when a
   * 16-bit image decoded into memory has its own buffer handed over without a copy (no `allocate`, not `shared`, and
   * no spool: see spooled-decode.ts).
   */
  onRows?: (frame: { width: number; height: number; data: Uint16Array }, endRow: number) => void;
  /** Takes back an array `allocate` supplied when the read then fails (for example to a pool of reused buffers). */
  release?: (array: Uint16Array) => void;
}

export interface NegativeImage {
  width: number;
  height: number;
  /** Interleaved R,G,B scanner counts at 16-bit full scale (an 8-bit file is scaled by 257). */
  data: Uint16Array;
  /** Bits per sample of the file as stored. */
  bitDepth: 8 | 16;
  format: Exclude<SniffedFormat, 'unknown'>;
  /** Things the operator should know that did not stop the read (8-bit source, dropped alpha...). */
  warnings: string[];
}

/** Where a PNG's bit depth is: 8 signature bytes, the IHDR chunk's length and type, width and height (PNG §11.2.2). */
const PNG_BIT_DEPTH_AT = 24;

/**
 * Reads a raw negative scan as 16-bit interleaved RGB.
 *
 * Accepts TIFF and PNG at 16 bits per sample; 8-bit TIFF, PNG and JPEG are read with a warning,
 * since 8 bits leave too few levels in the dense parts of a negative. Alpha is dropped with a
 * warning. An embedded ICC profile is ignored (with a warning): the scanner profile, not the file,
 * says how counts are encoded. Greyscale files are refused (`not-colour`): a colour negative needs
 * all three channels to sample the base and invert, and a grey copy would be silently wrong.
 *
 * Throws `ImageInputError` with code `missing`, `empty`, `not-an-image`, `truncated`,
 * `unsupported-format`, `too-many-pixels` (checked from the header, before decoding),
 * `unsupported-depth` or `not-colour`.
 *
 * @example
 *   const { width, height, data, warnings } = await readNegative('roll-12/frame-03.tif', { maxPixels: 60e6 });
 */
export async function readNegative(path: string, options: ReadNegativeOptions = {}): Promise<NegativeImage> {
  const maxPixels = options.maxPixels ?? DEFAULT_MAX_PIXELS;
  if (!Number.isInteger(maxPixels) || maxPixels < 1) {
    throw new TypeError(
      `Expected positive integer for maxPixels but received ${maxPixels} of type ${typeof maxPixels}`,
    );
  }

  const { head, format } = await readImageHead(path);
  const sniffed = format;
  const damaged = (cause: unknown) => damagedImageError(format, cause);

  const pipeline = (bits: 8 | 16) =>
    sharp(path, { limitInputPixels: maxPixels, failOn: 'error', ignoreIcc: true, sequentialRead: true })
      .removeAlpha()
      .toColourspace(bits === 16 ? 'rgb16' : 'srgb');
  const decode = (bits: 8 | 16) =>
    pipeline(bits)
      .raw({ depth: bits === 16 ? 'ushort' : 'uchar' })
      .toBuffer({ resolveWithObject: true });
  let allocated: Uint16Array | null = null;
  const given = options.allocate;
  const allocate = given
    ? (n: number) => (allocated = given(n))
    : options.shared
      ? (n: number) => new Uint16Array(new SharedArrayBuffer(n * 2))
      : undefined;
  // The decode is nearly all of a read, so it starts beside the header's, on another of libuv's threads, at the depth
  // the first bytes suggest (a JPEG or an 8-bit PNG: 8, else 16); a wrong guess decodes again once the header says.
  // libvips checks `limitInputPixels` from the header before it decodes any pixel. Settled here, so a refusal below
  // never leaves it rejected unheard; every refusal waits for it, so no decode outlives its read.
  const guess: 8 | 16 = sniffed === 'jpeg' || (sniffed === 'png' && head[PNG_BIT_DEPTH_AT] === 8) ? 8 : 16;
  // A 16-bit decode goes through a spool file read as it is written where there is one (spooled-decode.ts).
  const dir = guess === 16 ? spoolDir() : null;
  const spool = dir && spoolHasRoom(dir, SPOOL_MIN_FREE_BYTES) ? startSpooledDecode(pipeline(16), dir) : null;
  const early = spool
    ? null
    : decode(guess).then(
        (value) => ({ value, error: null }),
        (error: unknown) => ({ value: null, error }),
      );
  try {
    return await readWithHeader();
  } catch (error) {
    await early;
    if (allocated) options.release?.(allocated);
    throw error;
  } finally {
    await spool?.discard();
  }

  async function readWithHeader(): Promise<NegativeImage> {
    const { width, height, bitDepth, warnings } = await readNegativeHeader(path, { maxPixels });
    const samples = width * height * 3;
    const rows = { width, onRows: options.onRows };
    // Allocated once: a spooled read that fails is decoded again into the same array.
    let into = allocate;
    if (spool && bitDepth === 16) {
      const out = allocate ? allocate(samples) : new Uint16Array(samples);
      if (out.length < samples)
        throw new RangeError(`Expected at least ${samples} samples from allocate but received ${out.length}`);
      into = () => out;
      if (dir && spoolHasRoom(dir, samples * 2)) {
        try {
          return {
            width,
            height,
            data: await readSpool(spool, out, rows, height),
            bitDepth,
            format,
            warnings,
          };
        } catch (error) {
          // The caller's own failure ends the read; a damaged file fails again below, with sharp's own message, and
          // a spool that ran out of room is read there.
          if (error instanceof RowsCallbackError) throw error.cause;
        }
      }
      await spool.discard();
    }
    let raw: { data: Buffer; info: OutputInfo };
    let first: Awaited<NonNullable<typeof early>> | null = early && bitDepth === guess ? await early : null;
    if (first) {
      if (!first.value) throw damaged(first.error);
      raw = first.value;
    } else {
      // Let go of the guessed decode's pixels before the second decode holds its own.
      first = null;
      try {
        raw = await decode(bitDepth);
      } catch (cause) {
        throw damaged(cause);
      }
    }
    if (raw.info.channels !== 3 || raw.info.width !== width || raw.info.height !== height) {
      throw damaged(new Error(`decoded ${raw.info.width}x${raw.info.height}x${raw.info.channels}`));
    }
    const data = bitDepth === 16 ? toUint16(raw.data, into, rows) : expand8(raw.data, into, rows);
    if (data.length < samples)
      throw new RangeError(`Expected at least ${samples} samples from allocate but received ${data.length}`);
    return { width, height, data, bitDepth, format, warnings };
  }
}

/** A spooled decode read into `out`, `onRows` told band by band (about a megabyte each) as whole rows land. */
async function readSpool(
  from: SpooledDecode,
  out: Uint16Array,
  { width, onRows }: RowBands,
  height: number,
): Promise<Uint16Array> {
  const samples = width * height * 3;
  const rowBytes = width * 6;
  const frame = { width, height, data: out };
  const band = Math.max(1, Math.floor(BAND_BYTES / rowBytes));
  let told = 0;
  await from.readInto(new Uint8Array(out.buffer, out.byteOffset, samples * 2), width, height, (bytes) => {
    const rows = Math.floor(bytes / rowBytes);
    if (!onRows) return;
    while (rows - told >= band || (rows === height && told < height)) {
      told = Math.min(rows, told + band);
      try {
        onRows(frame, told);
      } catch (cause) {
        throw new RowsCallbackError(cause);
      }
    }
  });
  return out;
}

/** What `onRows` threw during a spooled read, kept apart from the spool's own failures. */
class RowsCallbackError extends Error {
  constructor(cause: unknown) {
    super('onRows failed', { cause });
  }
}

/** Rows copied at a time: about a megabyte of 16-bit RGB, which stays in cache for `onRows` (our choice). */
const BAND_BYTES = 1 << 20;

interface RowBands {
  width: number;
  onRows: ReadNegativeOptions['onRows'];
}

/** Copies `total` samples band by band of whole rows with `copy(from, to)`, telling `onRows` after each band. */
function copyInBands(
  out: Uint16Array,
  total: number,
  { width, onRows }: RowBands,
  copy: (from: number, to: number) => void,
) {
  if (!onRows) {
    copy(0, total);
    return;
  }
  const rowSamples = width * 3;
  const rows = total / rowSamples;
  const frame = { width, height: rows, data: out };
  const band = Math.max(1, Math.floor(BAND_BYTES / (rowSamples * 2)));
  for (let row = 0; row < rows; row += band) {
    const end = Math.min(rows, row + band);
    copy(row * rowSamples, end * rowSamples);
    onRows(frame, end);
  }
}

function toUint16(
  bytes: Buffer,
  allocate: ((n: number) => Uint16Array) | undefined,
  bands: RowBands,
): Uint16Array {
  const count = bytes.byteLength / 2;
  if (!allocate && bytes.byteOffset % 2 === 0) return new Uint16Array(bytes.buffer, bytes.byteOffset, count);
  const out = allocate ? allocate(count) : new Uint16Array(count);
  const target = new Uint8Array(out.buffer, out.byteOffset, bytes.byteLength);
  copyInBands(out, count, bands, (from, to) => target.set(bytes.subarray(2 * from, 2 * to), 2 * from));
  return out;
}

/** 8 → 16 bits by ×257, so 255 maps to 65535 (sharp's own cast shifts by 8 and stops at 65280). */
function expand8(
  bytes: Buffer,
  allocate: ((n: number) => Uint16Array) | undefined,
  bands: RowBands,
): Uint16Array {
  const out = allocate ? allocate(bytes.length) : new Uint16Array(bytes.length);
  copyInBands(out, bytes.length, bands, (from, to) => {
    for (let i = from; i < to; i++) out[i] = bytes[i]! * 257;
  });
  return out;
}
