import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { createJpegStripWriter, srgbProfileSegments } from './jpeg-strips';
import { encodePositive, positivePipeline } from './write-positive';

const metadata = {
  stock: 'Larkspur 200',
  profileVersion: 'larkspur-200@3',
  adjustments: { exposureStops: 0.5 },
};

/** A positive with edges, gradients and noise, so every block codes differently. */
function positive(width: number, height: number, seed = 7): Uint8Array {
  const out = new Uint8Array(width * height * 3);
  let s = seed;
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++) {
      s = (s * 1103515245 + 12345) >>> 0;
      const i = (y * width + x) * 3;
      out[i] = (x * 255) / width + ((s >>> 24) & 15);
      out[i + 1] = (y * 255) / height;
      out[i + 2] = ((x >> 3) + (y >> 3)) % 2 ? 200 : 40;
    }
  return out;
}

/** The marker segments up to SOS, as [marker, bytes]. */
function segments(jpeg: Buffer): [number, Buffer][] {
  const out: [number, Buffer][] = [];
  for (let i = 2; ;) {
    const end = i + 2 + jpeg.readUInt16BE(i + 2);
    out.push([jpeg[i + 1]!, jpeg.subarray(i, end)]);
    if (jpeg[i + 1] === 0xda) return out;
    i = end;
  }
}

const raw = (jpeg: Buffer) => sharp(jpeg).raw().toBuffer();

describe('JPEG written in strips', () => {
  for (const [quality, width, height] of [
    [92, 203, 141],
    [80, 190, 157],
    [100, 64, 8],
  ] as const) {
    it(`decodes to exactly the pixels of one whole-image encode (quality ${quality}, ${width} × ${height})`, async () => {
      const data = positive(width, height);
      const joined = await encodePositive(data, { width, height, format: 'jpeg', quality, metadata });
      const whole = await positivePipeline(data, {
        width,
        height,
        format: 'jpeg',
        quality,
        metadata,
      }).toBuffer();
      const meta = await sharp(joined).metadata();
      expect([meta.width, meta.height]).toEqual([width, height]);
      expect((await raw(joined)).equals(await raw(whole))).toBe(true);
    });
  }

  it('cycles RST0…RST7 over more than eight strips and still decodes to the whole-image pixels', async () => {
    const [width, height] = [203, 141];
    const data = positive(width, height);
    const writer = createJpegStripWriter({ width, height, quality: 92, metadata, strips: 12 });
    expect(writer.strips).toBe(9);
    for (let k = 0; k < writer.strips; k++) {
      const first = k * writer.stripRows * width * 3;
      writer.encode(k, data.subarray(first, first + writer.stripHeight(k) * width * 3));
    }
    const joined = await writer.finish();
    const restarts = [];
    for (let i = 0; i + 1 < joined.length; i++)
      if (joined[i] === 0xff && joined[i + 1]! >= 0xd0 && joined[i + 1]! <= 0xd7)
        restarts.push(joined[i + 1]! - 0xd0);
    expect(restarts).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    const whole = await positivePipeline(data, {
      width,
      height,
      format: 'jpeg',
      quality: 92,
      metadata,
    }).toBuffer();
    expect((await raw(joined)).equals(await raw(whole))).toBe(true);
  });

  it('is split into strips with restart markers between them when the image is tall enough', () => {
    const writer = createJpegStripWriter({ width: 203, height: 141, quality: 92, metadata });
    expect(writer.strips).toBeGreaterThan(1);
    expect(writer.stripRows % 8).toBe(0);
    expect(writer.stripRows * (writer.strips - 1) + writer.stripHeight(writer.strips - 1)).toBe(141);
  });

  it('carries the same header as a whole-image encode: EXIF with the full height, XMP, sRGB profile, tables', async () => {
    const [width, height] = [203, 141];
    const data = positive(width, height);
    const joined = await encodePositive(data, { width, height, format: 'jpeg', quality: 92, metadata });
    const whole = await positivePipeline(data, {
      width,
      height,
      format: 'jpeg',
      quality: 92,
      metadata,
    }).toBuffer();
    const joinedHeader = segments(joined);
    // The one addition: a DRI segment (ITU-T T.81 §B.2.4.4) giving the strip's MCU count.
    const dri = joinedHeader.filter(([m]) => m === 0xdd);
    expect(dri).toHaveLength(1);
    expect(dri[0]![1].readUInt16BE(4)).toBe(
      Math.ceil(width / 8) * (createJpegStripWriter({ width, height, quality: 92, metadata }).stripRows / 8),
    );
    const withoutDri = joinedHeader.filter(([m]) => m !== 0xdd).map(([, b]) => b.toString('hex'));
    expect(withoutDri).toEqual(segments(whole).map(([, b]) => b.toString('hex')));
    const read = await sharp(joined).metadata();
    expect(read.icc?.equals((await sharp(whole).metadata()).icc!)).toBe(true);
    expect(joined.subarray(-2).toString('hex')).toBe('ffd9');
  });

  it('attaches the very profile bytes sharp embeds for sRGB', async () => {
    const icc = await srgbProfileSegments();
    expect(icc.toString('latin1', 4, 16)).toBe('ICC_PROFILE\0');
  });

  it('refuses a strip of the wrong size and reports a strip never started', async () => {
    const writer = createJpegStripWriter({ width: 64, height: 64, quality: 92, metadata, strips: 2 });
    expect(() => writer.encode(0, new Uint8Array(10))).toThrow(
      'Expected 6144 samples for strip 0 but received 10',
    );
    expect(() => writer.encode(2, new Uint8Array(0))).toThrow('Expected integer between 0 and 1 for index');
    writer.encode(0, positive(64, 32));
    await expect(writer.finish()).rejects.toThrow('Strip 1 of 2 was never encoded');
  });

  it('keeps one strip, with no restarts, for an image too wide for a strip-sized restart interval', async () => {
    const writer = createJpegStripWriter({ width: 8 * 70_000, height: 32, quality: 92, metadata });
    expect(writer.strips).toBe(1);
    const small = await encodePositive(positive(16, 8), { width: 16, height: 8, format: 'jpeg', metadata });
    expect(segments(small).some(([m]) => m === 0xdd)).toBe(false);
  });
});
