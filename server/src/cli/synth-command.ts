import { mkdir, rename, unlink } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import { SYNTH_STOCKS, synthesizeNegative } from '../inversion-pool/inversion-kernel';
import { parseCommandArgs } from './parse-command-args';
import { UsageError } from './usage-error';

/** `clearbase synth --out DIR [--frames N] [--stock NAME]`: demo negatives from the forward model, 16-bit TIFF. */
export async function synthCommand(args: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(args, {
    out: { type: 'string' },
    frames: { type: 'string', default: '6' },
    stock: { type: 'string', default: 'larkspur-200' },
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
    const neg = synthesizeNegative({ width, height, stock, exposureStops, seed: n });
    const path = join(values.out, `${values.stock}-frame-${String(n).padStart(2, '0')}.tif`);
    await writeNegativeTiff(path, neg.data, width, height);
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
