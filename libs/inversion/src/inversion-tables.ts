import type { ScannerProfile } from '@clearbase/contracts';
import { densityAboveBase } from './density';
import { DENSITY_RANGE, RELATIVE_LOG_EXPOSURE_RANGE, type ResolvedInversion } from './invert-pixel';
import { linearise, FULL_SCALE_16 } from './scanner-input';
import type { Rgb } from './srgb';

/** Entries per channel of the density → log exposure table: 32768 over 5 D is 0.00015 D a step, linearly interpolated (sized by the equality test). */
export const EXPOSURE_TABLE_SIZE = 32768;

/**
 * Density above base of every 16-bit count, per channel (3 × 65536, channel after channel), held to DENSITY_RANGE:
 * the scanner's decoding, black level and gains and the film base folded into one table.
 * @example densityTable(LINEAR_SCANNER, [0.8, 0.8, 0.8])[6554] // ≈ 0.90 (log10(0.8 / 0.1))
 */
export function densityTable(scanner: ScannerProfile, base: Rgb): Float32Array {
  const [dMin, dMax] = DENSITY_RANGE;
  const table = new Float32Array(3 * 65536);
  for (let c = 0 as 0 | 1 | 2; c < 3; c++) {
    const b = base[c];
    for (let v = 0; v < 65536; v++) {
      const d = densityAboveBase(linearise(v / FULL_SCALE_16, scanner, c), b);
      table[c * 65536 + v] = d < dMin ? dMin : d > dMax ? dMax : d;
    }
  }
  return table;
}

/**
 * Relative log exposure (curve inverse + balance, exposure and −E_mid) at EXPOSURE_TABLE_SIZE densities evenly
 * spaced over DENSITY_RANGE, per channel (3 × size, channel after channel), held to RELATIVE_LOG_EXPOSURE_RANGE.
 * @example exposureTable(resolveInversion(params))[EXPOSURE_TABLE_SIZE - 1] // red at D = 4.5
 */
export function exposureTable(resolved: Pick<ResolvedInversion, 'curves' | 'offset'>): Float32Array {
  const [dMin, dMax] = DENSITY_RANGE;
  const [rMin, rMax] = RELATIVE_LOG_EXPOSURE_RANGE;
  const n = EXPOSURE_TABLE_SIZE;
  const table = new Float32Array(3 * n);
  for (let c = 0; c < 3; c++) {
    const curve = resolved.curves[c]!,
      offset = resolved.offset[c]!;
    for (let i = 0; i < n; i++) {
      const e = curve.inverse(dMin + ((dMax - dMin) * i) / (n - 1)) + offset;
      table[c * n + i] = e < rMin ? rMin : e > rMax ? rMax : e;
    }
  }
  return table;
}
