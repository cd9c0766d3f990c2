import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImageInputError } from './image-input-error';
import { readNegativeHeader } from './read-negative-header';
import { sampleNegative } from './sample-negative';
import { damageStrip, flatTiff } from './tiff-test-fixtures';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'clearbase-sample-'));
});
afterAll(() => rm(dir, { recursive: true, force: true }));

const sample = async (path: string, step: number) =>
  sampleNegative(path, await readNegativeHeader(path, { maxPixels: 1e8 }), step);

async function codeOf(promise: Promise<unknown>): Promise<string> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ImageInputError);
  return (error as ImageInputError).code;
}

describe('sampling a negative', () => {
  it('keeps every step-th pixel each way, as they are, at 16-bit full scale', async () => {
    const width = 320;
    const height = 200;
    const data = new Uint16Array(width * height * 3);
    for (let y = 0; y < height; y++)
      for (let x = 0; x < width; x++) data.set([x * 100, y * 100, 4242], (y * width + x) * 3);
    const path = join(dir, 'ramp.tif');
    await sharp(data, { raw: { width, height, channels: 3 } })
      .toColourspace('rgb16')
      .tiff({ compression: 'deflate', predictor: 'horizontal' })
      .toFile(path);
    const got = await sample(path, 8);
    expect([got.width, got.height, got.step]).toEqual([40, 25, 8]);
    // nearest neighbour: every sampled value is one of the file's own, 8 pixels from its neighbours
    const xs = Array.from({ length: got.width }, (_, i) => got.data[3 * i]!);
    const ys = Array.from({ length: got.height }, (_, j) => got.data[3 * got.width * j + 1]!);
    expect(xs.every((v, i) => v % 100 === 0 && (i === 0 || v - xs[i - 1]! === 800))).toBe(true);
    expect(ys.every((v, j) => v % 100 === 0 && (j === 0 || v - ys[j - 1]! === 800))).toBe(true);
    expect(got.data[2]).toBe(4242);
  });

  it('scales an 8-bit file to 16-bit full scale by 257', async () => {
    const path = join(dir, 'eight.png');
    await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 255, g: 128, b: 0 } } })
      .png()
      .toFile(path);
    const got = await sample(path, 4);
    expect(Array.from(got.data.subarray(0, 3))).toEqual([65535, 128 * 257, 0]);
  });

  it('rejects a damaged strip between two sampled rows', async () => {
    // 2 rows a strip, every 16th row sampled: strip 100 holds rows 200 and 201, neither of them sampled
    const path = await flatTiff(join(dir, 'damaged-middle.tif'), 2000, 1015, 2);
    await damageStrip(path, 100);
    expect(await codeOf(sample(path, 16))).toBe('truncated');
  });

  it('rejects a damaged last strip below the last sampled row', async () => {
    // 1015 rows sampled every 16th: 63 sample rows, none in the last strip (row 1014)
    const path = await flatTiff(join(dir, 'damaged-end.tif'), 2000, 1015, 2);
    await damageStrip(path, 'last');
    expect(await codeOf(sample(path, 16))).toBe('truncated');
  });

  it('refuses a step that is not a whole number from 1 to the shorter side', async () => {
    const path = await flatTiff(join(dir, 'flat.tif'), 40, 30);
    await expect(sample(path, 0)).rejects.toThrow(
      'Expected integer between 1 and 30 for step but received 0 of type number',
    );
    await expect(sample(path, 31)).rejects.toThrow(RangeError);
  });
});
