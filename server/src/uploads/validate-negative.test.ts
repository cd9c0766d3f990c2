import { LINEAR_SCANNER } from '@clearbase/inversion';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { measureNegativeBase } from '../film-base/measure-film-base';
import { ImageInputError, readNegative } from '../imaging/index';
import { flatTiff } from '../imaging/tiff-test-fixtures';
import { negativeTiff } from '../orders/order-test-fixtures';
import { validateNegative } from './validate-negative';
import { createValidationBudget, type ValidationBudget } from './validation-budget';

let dir: string;
/** A negative from the forward model large enough to be sampled every other pixel (step 2). */
let negative: Buffer;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'clearbase-validate-'));
  negative = await negativeTiff({ width: 1000, height: 700, seed: 5 });
});
afterAll(() => rm(dir, { recursive: true, force: true }));

/** A budget that notes every charge asked of it. */
function watchedBudget(): ValidationBudget & { charges: number[] } {
  const inner = createValidationBudget(1024 ** 3);
  const charges: number[] = [];
  return {
    charges,
    run: (bytes, work) => {
      charges.push(bytes);
      return inner.run(bytes, work);
    },
    state: inner.state,
  };
}

async function codeOf(promise: Promise<unknown>): Promise<string> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ImageInputError);
  return (error as ImageInputError).code;
}

/** The largest growth of this process's RSS, sampled every 5 ms while `work` runs (libvips works off the loop). */
async function rssGrowth(work: () => Promise<unknown>): Promise<number> {
  const start = process.memoryUsage().rss;
  let peak = start;
  const timer = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 5);
  try {
    await work();
  } finally {
    clearInterval(timer);
  }
  return Math.max(peak, process.memoryUsage().rss) - start;
}

const options = (budget: ValidationBudget, maxPixels = 120_000_000) => ({
  maxPixels,
  budget,
  scanner: LINEAR_SCANNER,
});

describe('validating an uploaded negative', () => {
  it('rejects a header claiming more pixels than the limit before decoding, without waiting for the budget', async () => {
    const path = await flatTiff(join(dir, 'large.tif'), 3000, 2000);
    const budget = watchedBudget();
    expect(await codeOf(validateNegative(path, options(budget, 5_000_000)))).toBe('too-many-pixels');
    expect(budget.charges).toEqual([]);
  });

  it('validates a small hostile deflate TIFF without decoding it whole, charging the budget its decoded size', async () => {
    const path = await flatTiff(join(dir, 'hostile.tif'), 6000, 6000);
    const decodedBytes = 6000 * 6000 * 6;
    const budget = watchedBudget();
    let validated: Awaited<ReturnType<typeof validateNegative>> | undefined;
    const growth = await rssGrowth(async () => (validated = await validateNegative(path, options(budget))));
    expect(validated!.header).toMatchObject({ format: 'tiff', width: 6000, height: 6000, bitDepth: 16 });
    expect(budget.charges).toEqual([decodedBytes]);
    expect(budget.state()).toEqual({ heldBytes: 0, running: 0, waiting: 0 });
    expect(growth).toBeLessThan(decodedBytes / 4);
    // The same measure sees the whole frame when it is decoded whole.
    expect(await rssGrowth(() => readNegative(path))).toBeGreaterThan(decodedBytes * 0.9);
  });

  it('rejects a file cut off half-way', async () => {
    const path = join(dir, 'cut-off.tif');
    await writeFile(path, negative.subarray(0, Math.floor(negative.length / 2)));
    expect(await codeOf(validateNegative(path, options(watchedBudget())))).toBe('truncated');
  });

  it('finds on a small frame the base measured on the whole frame', async () => {
    const path = join(dir, 'small.tif');
    await writeFile(path, await negativeTiff({ seed: 4 }));
    const { base } = await validateNegative(path, options(watchedBudget()));
    expect(base).toEqual(measureNegativeBase(await readNegative(path), LINEAR_SCANNER, null));
  });

  it('finds, on a frame sampled every other pixel, the base of the whole frame within half a percent', async () => {
    const path = join(dir, 'sampled-negative.tif');
    await writeFile(path, negative);
    const { base } = await validateNegative(path, options(watchedBudget()));
    const whole = measureNegativeBase(await readNegative(path), LINEAR_SCANNER, null);
    expect(base!.confidence).toBeGreaterThan(0.5);
    base!.rgb.forEach((v, c) => expect(Math.abs(v / whole.rgb[c]! - 1)).toBeLessThan(0.005));
  });
});
