// Set-up the library's tests share. For tests only: index.ts does not export it, and it reads the reference
// tables from disk, which the library itself never does (purity.test.ts holds both to that).
import { readFileSync } from 'node:fs';
import type { ScannerProfile } from '@clearbase/contracts';
import { invertPixel, resolveInversion, type InversionParams } from './index';
import type { Rgb } from './srgb';

/** One patch of the 24-patch chart: its name and published L*a*b* under D50. */
export interface ChartRow {
  name: string;
  labD50: Rgb;
}

/**
 * Published L*a*b* D50 of the 24-patch chart (McCamy, Marcus & Davidson, J. Appl. Photogr. Eng. 2(3):95-99, 1976;
 * the maker's 2016 values for charts made after November 2014), copied with their sources in test-data/reference.
 */
export const referenceChartRows: ChartRow[] = readFileSync(
  new URL('../../../test-data/reference/colour-rendition-chart-24.csv', import.meta.url),
  'utf8',
)
  .split('\n')
  .filter((l) => l && !l.startsWith('#'))
  .slice(1)
  .map((l) => l.split(','))
  .map((f) => ({ name: f[1]!, labD50: [Number(f[2]), Number(f[3]), Number(f[4])] as Rgb }));

/** A gamma-encoded scanner with a little black level and unequal gains, as a real one has (values invented). */
export const gammaTestScanner: ScannerProfile = {
  name: 'Test scanner',
  encoding: 'gamma',
  gamma: 2.2,
  blackLevel: [0.002, 0.002, 0.003],
  gains: [1.02, 1, 1.05],
};

/** 128 rows of random counts over 128 rows of three gradients, 256 × 256, the same every call. */
export function mixedTestImage(): Uint16Array {
  const w = 256,
    h = 256,
    data = new Uint16Array(w * h * 3);
  let s = 12345;
  const rand = () => (s = (Math.imul(s, 1103515245) + 12345) >>> 0) >>> 16;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = (y * w + x) * 3;
      if (y < h / 2) {
        data[i] = rand();
        data[i + 1] = rand();
        data[i + 2] = rand();
      } else {
        const v = Math.round((x / (w - 1)) * 65535);
        data[i] = v;
        data[i + 1] = (v * 7) >> 3;
        data[i + 2] = (v * 5) >> 3;
      }
    }
  }
  return data;
}

/**
 * The largest difference, in output code values, between `out` (an inversion of `input`) and the plain per-pixel
 * path's answer for the same pixels, looking at every `step`-th pixel.
 */
export function worstCodeDifference(
  params: InversionParams,
  input: Uint16Array,
  out: Uint8Array | Uint16Array,
  step: number,
): number {
  const r = resolveInversion(params);
  let worst = 0;
  for (let p = 0; p < input.length / 3; p += step) {
    const want = invertPixel(params, [input[3 * p]!, input[3 * p + 1]!, input[3 * p + 2]!], r);
    for (let c = 0; c < 3; c++) worst = Math.max(worst, Math.abs(want[c]! - out[3 * p + c]!));
  }
  return worst;
}
