import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { LINEAR_SCANNER, profileForStock, TINTLINE_400 } from '@clearbase/inversion';
import { demoNegative, writeNegativeTiff } from '../server/src/cli/synth-command';
import type { FrameSettings } from '../server/src/inversion-pool/invert-negative-file';

export const OUT_DIR = fileURLToPath(new URL('./out/', import.meta.url));

/** The settings every benchmark case inverts with: the stock's own profile, linear scanner, detected base, JPEG. */
export const BENCH_SETTINGS: FrameSettings = {
  profile: profileForStock(TINTLINE_400),
  scanner: LINEAR_SCANNER,
  base: 'auto',
  render: 'print',
  format: 'jpeg',
};

/** A 16-bit TIFF negative of the given size from the forward model, made once in bench/out/. */
export async function benchNegative(width: number, height: number): Promise<string> {
  await mkdir(OUT_DIR, { recursive: true });
  const path = join(OUT_DIR, `tintline-negative-${width}x${height}.tif`);
  if (!existsSync(path)) {
    const neg = demoNegative({ width, height, stock: TINTLINE_400, seed: 11 });
    await writeNegativeTiff(path, neg.data, neg.width, neg.height);
  }
  return path;
}
