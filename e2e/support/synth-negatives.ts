import { execFileSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Writes 16-bit negatives from the forward model (the command line's synth) into a new temporary folder and returns
 * it; the caller removes it.
 *
 * @example
 * const scans = synthNegatives('clearbase-scans-', { frames: 2, width: 240, height: 160 });
 */
export function synthNegatives(
  prefix: string,
  options: { frames: number; width: number; height: number; scene?: string },
): string {
  const folder = mkdtempSync(join(tmpdir(), prefix));
  const scene = options.scene ? ['--scene', options.scene] : [];
  execFileSync(
    process.execPath,
    [
      'bin/clearbase.mjs',
      'synth',
      '--out',
      folder,
      '--frames',
      String(options.frames),
      '--width',
      String(options.width),
      '--height',
      String(options.height),
      ...scene,
    ],
    { stdio: 'ignore' },
  );
  return folder;
}
