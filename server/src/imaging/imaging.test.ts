import { mkdtemp, readdir, rm, writeFile, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { crc32, deflateSync } from 'node:zlib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  ImageInputError,
  encodePositive,
  positivePipeline,
  readNegative,
  readPositiveMetadata,
  writePositive,
} from './index';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'clearbase-imaging-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const W = 48;
const H = 32;
/** Values chosen so none is a multiple of 257: an 8-bit detour would change every one. */
function ramp16(width = W, height = H): Uint16Array {
  const d = new Uint16Array(width * height * 3);
  for (let i = 0; i < d.length; i++) {
    let v = (i * 1237 + 1001) % 65536;
    if (v % 257 === 0) v += 1;
    d[i] = v;
  }
  return d;
}

async function write16(
  name: string,
  data: Uint16Array,
  format: 'tiff' | 'png',
  channels: 1 | 3 | 4 = 3,
): Promise<string> {
  const path = join(dir, name);
  const s = sharp(data, { raw: { width: W, height: H, channels } }).toColourspace(
    channels === 1 ? 'grey16' : 'rgb16',
  );
  await (format === 'tiff' ? s.tiff({ compression: 'deflate', predictor: 'horizontal' }) : s.png()).toFile(
    path,
  );
  return path;
}

async function expectCode(promise: Promise<unknown>, code: string): Promise<ImageInputError> {
  const error = await promise.then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ImageInputError);
  expect((error as ImageInputError).code).toBe(code);
  expect((error as ImageInputError).message.length).toBeGreaterThan(10);
  return error as ImageInputError;
}

/** A PNG whose header claims width × height but which carries almost no data. */
function pngClaiming(width: number, height: number): Buffer {
  const chunk = (type: string, body: Buffer) => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(body.length);
    const typed = Buffer.concat([Buffer.from(type, 'latin1'), body]);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(typed));
    return Buffer.concat([len, typed, crc]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 16; // bit depth
  ihdr[9] = 2; // colour type RGB
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.alloc(64))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

describe('readNegative', () => {
  it('reads a 16-bit TIFF with every value intact', async () => {
    const data = ramp16();
    const img = await readNegative(await write16('ramp.tif', data, 'tiff'));
    expect(img).toMatchObject({ width: W, height: H, bitDepth: 16, format: 'tiff', warnings: [] });
    expect(Array.from(img.data)).toEqual(Array.from(data));
  });

  it('reads a 16-bit PNG into shared memory when asked', async () => {
    const data = ramp16();
    const img = await readNegative(await write16('ramp.png', data, 'png'), { shared: true });
    expect(img.data.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(img.bitDepth).toBe(16);
    expect(Array.from(img.data)).toEqual(Array.from(data));
  });

  it('copies the pixels into the array an allocate callback supplies', async () => {
    const data = ramp16();
    const target = new Uint16Array(new SharedArrayBuffer(data.length * 2));
    const img = await readNegative(await write16('into.tif', data, 'tiff'), {
      allocate: (n) => (n === data.length ? target : new Uint16Array(n)),
    });
    expect(img.data).toBe(target);
    expect(Array.from(target)).toEqual(Array.from(data));
  });

  it('tells onRows, band by band of about a megabyte, how many rows of the copy are in place', async () => {
    // 3000 × 400: 18 000 bytes a row, so 58 rows a band and 7 bands.
    const [w, h] = [3000, 400];
    const data = ramp16(w, h);
    const path = join(dir, 'bands.tif');
    await sharp(data, { raw: { width: w, height: h, channels: 3 } })
      .toColourspace('rgb16')
      .tiff({ compression: 'deflate' })
      .toFile(path);
    const seen: number[] = [];
    let wrong = 0;
    const img = await readNegative(path, {
      shared: true,
      onRows: ({ data: copy }, endRow) => {
        seen.push(endRow);
        // the band just copied holds its decoded values
        const from = (seen.at(-2) ?? 0) * w * 3;
        for (let i = from; i < endRow * w * 3; i++) if (copy[i] !== data[i]) wrong++;
      },
    });
    expect(seen).toEqual([58, 116, 174, 232, 290, 348, 400]);
    expect(wrong).toBe(0);
    expect(Buffer.from(img.data.buffer).equals(Buffer.from(data.buffer))).toBe(true);
  });

  // A PNG says its depth in its first bytes; a TIFF is first decoded as 16-bit and again once its header says 8.
  for (const format of ['png', 'tiff'] as const) {
    it(`reads an 8-bit ${format} file scaled to 16-bit full scale, with a warning`, async () => {
      const path = join(dir, `eight.${format}`);
      await sharp(new Uint8Array(W * H * 3).fill(200), { raw: { width: W, height: H, channels: 3 } })
        .toFormat(format)
        .toFile(path);
      const img = await readNegative(path);
      expect(img.bitDepth).toBe(8);
      expect(img.data.length).toBe(W * H * 3);
      expect(img.data.every((v) => v === 200 * 257)).toBe(true);
      expect(img.warnings.join(' ')).toMatch(/8 bits/);
    });
  }

  it('drops an alpha channel with a warning', async () => {
    const rgba = new Uint16Array(W * H * 4).fill(40000);
    const img = await readNegative(await write16('alpha.png', rgba, 'png', 4));
    expect(img.data.length).toBe(W * H * 3);
    expect(img.warnings.join(' ')).toMatch(/alpha/);
  });

  it('refuses a greyscale scan', async () => {
    const grey = new Uint16Array(W * H).fill(30000);
    await expectCode(readNegative(await write16('grey.tif', grey, 'tiff', 1)), 'not-colour');
  });

  it('rejects a truncated TIFF as damaged', async () => {
    const whole = await readFile(await write16('whole.tif', ramp16(), 'tiff'));
    const path = join(dir, 'cut.tif');
    await writeFile(path, whole.subarray(0, whole.length >> 1));
    const error = await expectCode(readNegative(path), 'truncated');
    expect(error.message).toMatch(/TIFF/);
  });

  it('rejects a truncated PNG as damaged', async () => {
    const whole = await readFile(await write16('whole.png', ramp16(), 'png'));
    const path = join(dir, 'cut.png');
    await writeFile(path, whole.subarray(0, whole.length >> 1));
    await expectCode(readNegative(path), 'truncated');
  });

  it('rejects a text file as not an image', async () => {
    const path = join(dir, 'notes.tif');
    await writeFile(path, 'frame 3 looks underexposed\n');
    await expectCode(readNegative(path), 'not-an-image');
  });

  it('rejects a zero-byte file', async () => {
    const path = join(dir, 'zero.tif');
    await writeFile(path, '');
    await expectCode(readNegative(path), 'empty');
  });

  it('rejects a missing file', async () => {
    await expectCode(readNegative(join(dir, 'nowhere.tif')), 'missing');
  });

  it('rejects a PNG claiming 100000 × 100000 pixels from its header alone', async () => {
    const path = join(dir, 'huge.png');
    await writeFile(path, pngClaiming(100_000, 100_000));
    const error = await expectCode(readNegative(path), 'too-many-pixels');
    expect(error.message).toMatch(/100000 × 100000/);
  });

  it('honours a smaller configured pixel limit', async () => {
    await expectCode(
      readNegative(await write16('small.tif', ramp16(), 'tiff'), { maxPixels: W * H - 1 }),
      'too-many-pixels',
    );
  });

  it('validates maxPixels before touching the file', async () => {
    await expect(readNegative('whatever.tif', { maxPixels: 0 })).rejects.toThrow(
      'Expected positive integer for maxPixels but received 0 of type number',
    );
  });
});

describe('writePositive', () => {
  const metadata = {
    stock: 'Larkspur 200',
    profileVersion: 'larkspur-200@3',
    adjustments: { cyanRedPoints: -2, exposureStops: 0.5 },
  };

  for (const format of ['tiff16', 'png16'] as const) {
    it(`keeps all 16 bits and the metadata in a ${format} round trip`, async () => {
      const data = ramp16();
      const path = join(dir, `positive.${format}`);
      await writePositive(data, { path, width: W, height: H, format, metadata });
      const back = await readNegative(path);
      expect(back.bitDepth).toBe(16);
      expect(Array.from(back.data)).toEqual(Array.from(data));
      const read = await readPositiveMetadata(path);
      expect(read.metadata).toEqual(metadata);
      expect(read.bitDepth).toBe(16);
    });
  }

  it('writes a JPEG with the sRGB profile, EXIF description and XMP metadata', async () => {
    const data = new Uint8Array(W * H * 3).fill(128);
    const path = join(dir, 'positive.jpg');
    await writePositive(data, { path, width: W, height: H, format: 'jpeg', quality: 90, metadata });
    const read = await readPositiveMetadata(path);
    expect(read.hasIccProfile).toBe(true);
    expect(read.metadata).toEqual(metadata);
    expect(read.exifDescription).toMatch(/stock Larkspur 200; profile larkspur-200@3/);
    const { data: px } = await sharp(path).raw().toBuffer({ resolveWithObject: true });
    expect(Math.abs(px[0]! - 128)).toBeLessThanOrEqual(1);
  });

  it('rounds 16-bit data to the nearest 8-bit code value for JPEG', async () => {
    const data = new Uint16Array(W * H * 3).fill(1001); // 1001 / 257 = 3.9 -> 4
    const jpeg = await encodePositive(data, { width: W, height: H, format: 'jpeg', quality: 100 });
    const { data: px } = await sharp(jpeg).raw().toBuffer({ resolveWithObject: true });
    expect(px[0]).toBe(4);
  });

  it('leaves no file behind when the write fails', async () => {
    const sub = join(dir, 'no-such-folder');
    await expect(
      writePositive(ramp16(), { path: join(sub, 'x.tif'), width: W, height: H, format: 'tiff16' }),
    ).rejects.toThrow();
    expect((await readdir(dir)).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('validates its parameters with messages of one shape', () => {
    const data = ramp16();
    expect(() => positivePipeline(data, { width: W, height: H, format: 'jpeg', quality: 0 })).toThrow(
      'Expected integer between 1 and 100 for quality but received 0 of type number',
    );
    expect(() =>
      positivePipeline(new Uint8Array(W * H * 3), { width: W, height: H, format: 'png16' }),
    ).toThrow('Expected Uint16Array for data of a png16 positive but received Uint8Array');
    expect(() => positivePipeline(data, { width: W + 1, height: H, format: 'tiff16' })).toThrow(
      /Expected 4704 samples/,
    );
  });
});
