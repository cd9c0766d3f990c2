import { mkdir, rename, unlink } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import {
  DEMO_STOCKS,
  exposeNegative,
  LINEAR_SCANNER,
  outdoorScene,
  type FilmStock,
} from '@clearbase/inversion';
import { parseCommandArgs } from './parse-command-args';
import { UsageError } from './usage-error';

/** The forward model's demo stocks by command-line name: the kebab-case of the stock's name. */
export const SYNTH_STOCKS: Readonly<Record<string, FilmStock>> = Object.fromEntries(
  DEMO_STOCKS.map((stock) => [stockKey(stock), stock]),
);

/** Kebab-case of a stock's name, e.g. 'clearbase-polyclear-200' (also the id of `profileForStock`). */
export function stockKey(stock: FilmStock): string {
  return stock.name.toLowerCase().replace(/[^a-z0-9]+/g, '-');
}

/** Rebate strips above and below the frame, as a fraction of the scan's height (invented, typical of 35 mm). */
const REBATE_FRACTION = 0.06;

/**
 * One demo negative of `width` × `height` pixels: the outdoor scene between unexposed rebate strips
 * with sprocket holes, light grain and a little dust.
 */
export function demoNegative(options: {
  width: number;
  height: number;
  stock: FilmStock;
  exposureStops?: number;
  seed?: number;
}): ReturnType<typeof exposeNegative> {
  const rebate = Math.max(4, Math.round(REBATE_FRACTION * options.height));
  return exposeNegative(outdoorScene(options.width, Math.max(1, options.height - 2 * rebate)), {
    stock: options.stock,
    scanner: LINEAR_SCANNER,
    exposureStops: options.exposureStops ?? 0,
    grain: 0.004,
    seed: options.seed ?? 1,
    rebate,
    sprocketHoles: true,
    dust: 3,
  });
}

/** `clearbase synth --out DIR [--frames N] [--stock NAME]`: demo negatives from the forward model, 16-bit TIFF. */
export async function synthCommand(args: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(args, {
    out: { type: 'string' },
    frames: { type: 'string', default: '6' },
    stock: { type: 'string', default: 'clearbase-polyclear-200' },
    width: { type: 'string', default: '1200' },
    height: { type: 'string', default: '800' },
  });
  if (positionals.length) throw new UsageError(`Unexpected argument "${positionals[0]}".`);
  if (!values.out) throw new UsageError('Missing --out DIR.');
  const frames = integerOption('frames', values.frames, 1, 100);
  const width = integerOption('width', values.width, 16, 20000);
  const height = integerOption('height', values.height, 16, 20000);
  const stock = SYNTH_STOCKS[values.stock];
  if (!stock)
    throw new UsageError(`Unknown stock "${values.stock}"; known: ${Object.keys(SYNTH_STOCKS).join(', ')}.`);
  await mkdir(values.out, { recursive: true });
  for (let n = 1; n <= frames; n++) {
    // Exposures spread over ±1 stop across the roll, as a real roll varies.
    const exposureStops = frames === 1 ? 0 : -1 + (2 * (n - 1)) / (frames - 1);
    const neg = demoNegative({ width, height, stock, exposureStops, seed: n });
    const path = join(values.out, `${values.stock}-frame-${String(n).padStart(2, '0')}.tif`);
    await writeNegativeTiff(path, neg.data, neg.width, neg.height);
    process.stdout.write(`${path}\n`);
  }
  return 0;
}

/** 16-bit deflate TIFF written under a temporary name and renamed into place. */
export async function writeNegativeTiff(
  path: string,
  data: Uint16Array,
  width: number,
  height: number,
): Promise<void> {
  const tmp = `${path}.${process.pid}.tmp`;
  try {
    await sharp(data, { raw: { width, height, channels: 3 } })
      .toColourspace('rgb16')
      .tiff({ compression: 'deflate', predictor: 'horizontal' })
      .toFile(tmp);
    await rename(tmp, path);
  } catch (error) {
    await unlink(tmp).catch(() => undefined);
    throw error;
  }
}

export function integerOption(name: string, raw: string | undefined, min: number, max: number): number {
  const value = Number(raw);
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new UsageError(`Expected integer between ${min} and ${max} for --${name} but received ${raw}.`);
  }
  return value;
}
