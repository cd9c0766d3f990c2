import sharp from 'sharp';
import { describePositive, positiveXmp, type PositiveMetadata } from './positive-metadata';

/**
 * A JPEG encoded as horizontal strips, each strip its own sharp encode (so strips run in parallel on libuv's
 * threads, and a strip can start as soon as its rows exist), joined into one baseline JPEG with a restart marker
 * between strips (ITU-T T.81 §B.2.4.4, restart intervals; §F.1.1.5.1, the DC predictions reset at each restart).
 *
 * Every strip has a whole number of MCU rows and the same quality and subsampling, hence the same quantisation and
 * Huffman tables (standard tables, no optimised coding), so the joined file decodes to exactly the pixels of one
 * encode of the whole image. The sRGB ICC profile is attached as bytes (ICC.1:2010 Annex B.4, APP2 "ICC_PROFILE"),
 * without sharp's sRGB → sRGB transform, which leaves 8-bit values as they are and cost 0.1–0.4 s at 24 MP.
 * The header (EXIF, XMP, ICC, tables) is the one a single encode of the whole image writes, with the image height
 * in SOF and in EXIF PixelYDimension, plus a DRI segment.
 */
export interface JpegStripWriter {
  /** Rows in every strip but the last (a whole number of MCU rows). */
  readonly stripRows: number;
  /** Number of strips. */
  readonly strips: number;
  /**
   * Starts encoding strip `index` from `rows` (interleaved 8-bit RGB of its `stripHeight(index)` rows); the array
   * must not change until `finish` resolves.
   */
  encode(index: number, rows: Uint8Array): void;
  /** Rows in strip `index`. */
  stripHeight(index: number): number;
  /** Waits for every strip (each must have been started) and returns the joined JPEG. */
  finish(): Promise<Buffer>;
  /** Resolves once no started strip is still reading its rows (whether it succeeded or not). */
  settled(): Promise<void>;
}

export interface JpegStripOptions {
  width: number;
  height: number;
  quality: number;
  metadata: PositiveMetadata;
  /** Strips wanted; fewer are made for a small image or a very wide one. Default 8. */
  strips?: number;
}

// Eight strips: enough for two cores to share the encode and for strips to follow the inversion closely; few
// enough that each strip's own set-up (about a millisecond) stays small. Measured here, see bench/README.md.
const DEFAULT_STRIPS = 8;
// A restart interval is a 16-bit count of MCUs (ITU-T T.81 §B.2.4.4).
const MAX_RESTART_INTERVAL = 0xffff;

/** Plans the strips of a JPEG of `width` × `height`; see `JpegStripWriter`. */
export function createJpegStripWriter(options: JpegStripOptions): JpegStripWriter {
  const { width, height, quality, metadata } = options;
  for (const [name, value, max] of [
    ['width', width, 1 << 20],
    ['height', height, 1 << 20],
    ['quality', quality, 100],
  ] as const)
    if (!Number.isInteger(value) || value < 1 || value > max)
      throw new TypeError(
        `Expected integer between 1 and ${max} for ${name} but received ${value} of type ${typeof value}`,
      );
  const subsampling = chromaSubsampling(quality);
  // An MCU is 8 × 8 pixels at 4:4:4 and 16 × 16 at 4:2:0 (ITU-T T.81 §A.2.4).
  const mcu = subsampling === '4:4:4' ? 8 : 16;
  const mcusPerRow = Math.ceil(width / mcu);
  const mcuRows = Math.ceil(height / mcu);
  const maxMcuRowsPerStrip = Math.floor(MAX_RESTART_INTERVAL / mcusPerRow);
  const wanted = Math.max(1, Math.floor(options.strips ?? DEFAULT_STRIPS));
  let stripMcuRows = Math.ceil(mcuRows / wanted);
  // Too wide for a restart interval of a whole strip: one strip, no restarts.
  if (maxMcuRowsPerStrip < 1) stripMcuRows = mcuRows;
  else stripMcuRows = Math.min(stripMcuRows, maxMcuRowsPerStrip);
  const stripRows = stripMcuRows * mcu;
  const strips = Math.ceil(height / stripRows);
  const restartInterval = strips > 1 ? stripMcuRows * mcusPerRow : 0;
  const encoded: (Promise<Buffer> | undefined)[] = new Array<Promise<Buffer> | undefined>(strips);
  const stripHeight = (index: number) => Math.min(stripRows, height - index * stripRows);

  return {
    stripRows,
    strips,
    stripHeight,
    encode(index, rows) {
      if (!Number.isInteger(index) || index < 0 || index >= strips)
        throw new RangeError(
          `Expected integer between 0 and ${strips - 1} for index but received ${index} of type ${typeof index}`,
        );
      const h = stripHeight(index);
      if (rows.length !== width * h * 3)
        throw new RangeError(
          `Expected ${width * h * 3} samples for strip ${index} but received ${rows.length}`,
        );
      let pipeline = sharp(rows, { raw: { width, height: h, channels: 3 } });
      // The first strip carries the metadata; the others' headers are dropped when joining.
      if (index === 0)
        pipeline = pipeline
          .withExif({ IFD0: { ImageDescription: describePositive(metadata), Software: 'Clearbase' } })
          .withXmp(positiveXmp(metadata));
      const done = pipeline
        .jpeg({ quality, chromaSubsampling: subsampling, optimiseCoding: false })
        .toBuffer();
      // Rejections are reported by finish; keep an early one from counting as unhandled meanwhile.
      done.catch(() => undefined);
      encoded[index] = done;
    },
    async finish() {
      const parts: Buffer[] = [];
      for (let k = 0; k < strips; k++) {
        const part = encoded[k];
        if (!part) throw new RangeError(`Strip ${k} of ${strips} was never encoded`);
        parts.push(await part);
      }
      return joinJpegStrips(parts, { height, restartInterval, icc: await srgbProfileSegments() });
    },
    async settled() {
      await Promise.allSettled(encoded.filter(Boolean));
    },
  };
}

/** Subsampling the product uses at a quality: 4:4:4 at 90 and over, else 4:2:0 (see `positivePipeline`). */
export function chromaSubsampling(quality: number): '4:4:4' | '4:2:0' {
  return quality >= 90 ? '4:4:4' : '4:2:0';
}

interface Segment {
  marker: number;
  /** Offset of the segment's 0xFF marker byte. */
  start: number;
  /** Offset just past the segment (its length field counts itself, not the marker). */
  end: number;
}

/** The marker segments of a JPEG from SOI up to and including SOS (ITU-T T.81 §B.1.1.4, §B.2). */
function headerSegments(jpeg: Uint8Array): Segment[] {
  if (jpeg[0] !== 0xff || jpeg[1] !== 0xd8) throw new Error('Expected a JPEG starting with SOI');
  const segments: Segment[] = [];
  let i = 2;
  for (;;) {
    if (i + 4 > jpeg.length || jpeg[i] !== 0xff) throw new Error(`Expected a JPEG marker at byte ${i}`);
    const marker = jpeg[i + 1]!;
    const end = i + 2 + ((jpeg[i + 2]! << 8) | jpeg[i + 3]!);
    segments.push({ marker, start: i, end });
    if (marker === 0xda) return segments;
    i = end;
  }
}

/** The entropy-coded data after a strip's SOS header, up to its EOI. */
function scanData(jpeg: Buffer): Buffer {
  const sos = headerSegments(jpeg).at(-1)!;
  const endsWithEoi = jpeg[jpeg.length - 2] === 0xff && jpeg[jpeg.length - 1] === 0xd9;
  if (!endsWithEoi) throw new Error('Expected a JPEG ending with EOI');
  return jpeg.subarray(sos.end, jpeg.length - 2);
}

/**
 * Joins strips encoded alike into one JPEG of `height` rows: the first strip's header with the ICC segments
 * after its APP segments, the height set in SOF and EXIF, a DRI segment before SOS when there are restarts;
 * then each strip's entropy-coded data, RST0…RST7 in turn between them; EOI.
 * Throws when the strips' tables differ (they were not encoded alike).
 */
export function joinJpegStrips(
  strips: Buffer[],
  { height, restartInterval, icc }: { height: number; restartInterval: number; icc: Buffer },
): Buffer {
  const first = strips[0]!;
  const segments = headerSegments(first);
  const tablesFrom = (jpeg: Buffer, list: Segment[]) => {
    const tables = list.filter((s) => s.marker === 0xdb || s.marker === 0xc4 || s.marker === 0xda);
    return Buffer.concat(tables.map((s) => jpeg.subarray(s.start, s.end)));
  };
  const tables = tablesFrom(first, segments);
  for (const [k, strip] of strips.entries())
    if (k > 0 && !tablesFrom(strip, headerSegments(strip)).equals(tables))
      throw new Error(`Strip ${k} was encoded with other tables than strip 0`);
  const out: Buffer[] = [first.subarray(0, 2)];
  let iccPlaced = false;
  for (const s of segments) {
    const isApp = s.marker >= 0xe0 && s.marker <= 0xef;
    if (!isApp && !iccPlaced) {
      out.push(icc);
      iccPlaced = true;
    }
    const bytes = Buffer.from(first.subarray(s.start, s.end));
    if (s.marker === 0xc0) bytes.writeUInt16BE(height, 5);
    if (s.marker === 0xe1 && bytes.subarray(4, 10).toString('latin1') === 'Exif\0\0')
      setExifPixelHeight(bytes.subarray(10), height);
    if (s.marker === 0xda && restartInterval > 0) {
      const dri = Buffer.from([0xff, 0xdd, 0x00, 0x04, 0, 0]);
      dri.writeUInt16BE(restartInterval, 4);
      out.push(dri);
    }
    out.push(bytes);
  }
  for (const [k, strip] of strips.entries()) {
    if (k > 0) out.push(Buffer.from([0xff, 0xd0 + ((k - 1) % 8)]));
    out.push(scanData(strip));
  }
  out.push(Buffer.from([0xff, 0xd9]));
  return Buffer.concat(out);
}

/**
 * Sets PixelYDimension (tag 0xA003, EXIF 2.3 §4.6.5) in the EXIF IFD of a TIFF-structured EXIF block, in place,
 * when present; a SHORT that cannot hold the height is an error.
 */
function setExifPixelHeight(tiff: Buffer, height: number): void {
  const little = tiff.toString('latin1', 0, 2) === 'II';
  const u16 = (o: number) => (little ? tiff.readUInt16LE(o) : tiff.readUInt16BE(o));
  const u32 = (o: number) => (little ? tiff.readUInt32LE(o) : tiff.readUInt32BE(o));
  const entries = (ifd: number) =>
    Array.from({ length: u16(ifd) }, (_, k) => ifd + 2 + 12 * k).map((at) => ({
      at,
      tag: u16(at),
      type: u16(at + 2),
    }));
  const pointer = entries(u32(4)).find((e) => e.tag === 0x8769);
  if (!pointer) return;
  const entry = entries(u32(pointer.at + 8)).find((e) => e.tag === 0xa003);
  if (!entry) return;
  if (entry.type === 3) {
    if (height > 0xffff) throw new RangeError(`EXIF PixelYDimension is a SHORT and cannot hold ${height}`);
    if (little) tiff.writeUInt16LE(height, entry.at + 8);
    else tiff.writeUInt16BE(height, entry.at + 8);
  } else if (little) tiff.writeUInt32LE(height, entry.at + 8);
  else tiff.writeUInt32BE(height, entry.at + 8);
}

let srgbSegments: Promise<Buffer> | null = null;

/** The APP2 ICC segments sharp writes for its built-in sRGB profile, taken once from a one-pixel JPEG. */
export function srgbProfileSegments(): Promise<Buffer> {
  srgbSegments ??= sharp(Buffer.from([128, 128, 128]), { raw: { width: 1, height: 1, channels: 3 } })
    .withIccProfile('srgb')
    .jpeg()
    .toBuffer()
    .then((jpeg) => {
      const icc = headerSegments(jpeg).filter(
        (s) => s.marker === 0xe2 && jpeg.toString('latin1', s.start + 4, s.start + 16) === 'ICC_PROFILE\0',
      );
      if (!icc.length) throw new Error('sharp wrote no ICC profile for srgb');
      return Buffer.concat(icc.map((s) => jpeg.subarray(s.start, s.end)));
    });
  return srgbSegments;
}
