import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { writeNegativeTiff } from '../server/src/cli/synth-command';
import { SYNTH_STOCKS, synthesizeNegative } from '../server/src/inversion-pool/inversion-kernel';
import { LINEAR_SCANNER, NEUTRAL_STOCK } from '../server/src/inversion-pool/inversion-kernel';
import type { FrameSettings } from '../server/src/inversion-pool/invert-negative-file';

export const OUT_DIR = fileURLToPath(new URL('./out/', import.meta.url));

/** The settings every benchmark case inverts with: neutral stock, linear scanner, detected base, JPEG. */
export const BENCH_SETTINGS: FrameSettings = {
  stock: { ...NEUTRAL_STOCK, gamma: SYNTH_STOCKS['tidewater-400']!.gamma },
  scanner: LINEAR_SCANNER,
  base: 'auto',
  render: 'print',
  format: 'jpeg',
};

/** A 16-bit TIFF negative of the given size from the forward model, made once in bench/out/. */
export async function benchNegative(width: number, height: number): Promise<string> {
  await mkdir(OUT_DIR, { recursive: true });
  const path = join(OUT_DIR, `negative-${width}x${height}.tif`);
  if (!existsSync(path)) {
    const neg = synthesizeNegative({ width, height, stock: SYNTH_STOCKS['tidewater-400']!, seed: 11 });
    await writeNegativeTiff(path, neg.data, width, height);
  }
  return path;
}
