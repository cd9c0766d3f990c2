import type { ScannerProfile } from '@clearbase/contracts';
import { MIN_TRANSMITTANCE } from './density';
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
  const key = JSON.stringify([scanner, base]);
  if (lastDensity?.key === key) return lastDensity.table.slice();
  const table = buildDensityTable(scanner, base);
  lastDensity = { key, table };
  return table.slice();
}

// The last table of each kind, by the content it was made from: a frame's levels and its plan, and the frames
// of a roll, ask for the same ones. Handed out as copies, so a caller may keep or change its own.
let lastDensity: { key: string; table: Float32Array } | null = null;
let lastInverse: { key: string; table: Float64Array } | null = null;

function buildDensityTable(scanner: ScannerProfile, base: Rgb): Float32Array {
  const [dMin, dMax] = DENSITY_RANGE;
  const logLight = scannerLogLight(scanner);
  const table = new Float32Array(3 * 65536);
  for (let c = 0 as 0 | 1 | 2; c < 3; c++) {
    // D = log10(B / L) = log10 B − log10 L (densityAboveBase), with the scanner's part kept from frame to frame.
    const logBase = Math.log10(Math.max(base[c], MIN_TRANSMITTANCE));
    for (let v = c * 65536; v < (c + 1) * 65536; v++) {
      const d = logBase - logLight[v]!;
      table[v] = d < dMin ? dMin : d > dMax ? dMax : d;
    }
  }
  return table;
}

let lastLogLight: { key: string; table: Float64Array } | null = null;

/**
 * log10 of the linear light of every 16-bit count, per channel (3 × 65536), held to MIN_TRANSMITTANCE: the scanner's
 * part of the density table, which does not change with the base, so each frame's own base costs a subtraction a
 * count instead of a decoding and a logarithm. The last scanner's is kept.
 */
function scannerLogLight(scanner: ScannerProfile): Float64Array {
  const key = JSON.stringify(scanner);
  if (lastLogLight?.key === key) return lastLogLight.table;
  const table = new Float64Array(3 * 65536);
  for (let c = 0 as 0 | 1 | 2; c < 3; c++)
    for (let v = 0; v < 65536; v++)
      table[c * 65536 + v] = Math.log10(
        Math.max(linearise(v / FULL_SCALE_16, scanner, c), MIN_TRANSMITTANCE),
      );
  lastLogLight = { key, table };
  return table;
}

/**
 * Relative log exposure (curve inverse + balance, exposure and −E_mid) at EXPOSURE_TABLE_SIZE densities evenly
 * spaced over DENSITY_RANGE, per channel (3 × size, channel after channel), held to RELATIVE_LOG_EXPOSURE_RANGE.
 * `curvesKey` (the curves' control points as text) lets the curve inverses be reused from the last call.
 * @example exposureTable(resolveInversion(params))[EXPOSURE_TABLE_SIZE - 1] // red at D = 4.5
 */
export function exposureTable(
  resolved: Pick<ResolvedInversion, 'curves' | 'offset'>,
  curvesKey?: string,
): Float32Array {
  const [rMin, rMax] = RELATIVE_LOG_EXPOSURE_RANGE;
  const n = EXPOSURE_TABLE_SIZE;
  const inverse = curveInverses(resolved, curvesKey);
  const table = new Float32Array(3 * n);
  for (let c = 0; c < 3; c++) {
    const offset = resolved.offset[c]!;
    for (let i = c * n; i < (c + 1) * n; i++) {
      const e = inverse[i]! + offset;
      table[i] = e < rMin ? rMin : e > rMax ? rMax : e;
    }
  }
  return table;
}

/** Each channel's curve inverse at the table's densities; the last set is kept by `curvesKey` when one is given. */
function curveInverses(
  resolved: Pick<ResolvedInversion, 'curves'>,
  curvesKey: string | undefined,
): Float64Array {
  if (curvesKey !== undefined && lastInverse?.key === curvesKey) return lastInverse.table;
  const [dMin, dMax] = DENSITY_RANGE;
  const n = EXPOSURE_TABLE_SIZE;
  const table = new Float64Array(3 * n);
  for (let c = 0; c < 3; c++) {
    const curve = resolved.curves[c]!;
    for (let i = 0; i < n; i++) table[c * n + i] = curve.inverse(dMin + ((dMax - dMin) * i) / (n - 1));
  }
  if (curvesKey !== undefined) lastInverse = { key: curvesKey, table };
  return table;
}
