import type { Rgb } from '@clearbase/inversion';

/** Per-channel counts over equal bins, and the largest count (for scaling the drawing). */
export interface Histogram {
  bins: [Uint32Array, Uint32Array, Uint32Array];
  peak: number;
  /** Value of the first and the last bin's edge. */
  range: [number, number];
}

// 64 bins show the shape of a channel on a 300-pixel-wide panel: our choice
const BINS = 64;
// densities above base of a colour negative lie within 0 to 3, common practice of the trade, from memory
const DENSITY_SPAN: [number, number] = [0, 3];
// read every 4th pixel: 1.5 MP gives ~94 000 samples per channel, plenty for a histogram (our choice)
const STRIDE = 4;

function histogram(
  range: [number, number],
  fill: (add: (c: 0 | 1 | 2, v: number) => void) => void,
): Histogram {
  const bins: Histogram['bins'] = [new Uint32Array(BINS), new Uint32Array(BINS), new Uint32Array(BINS)];
  const [lo, hi] = range;
  fill((c, v) => {
    const i = Math.min(BINS - 1, Math.max(0, Math.floor(((v - lo) / (hi - lo)) * BINS)));
    bins[c][i]!++;
  });
  let peak = 0;
  for (const b of bins) for (const v of b) peak = Math.max(peak, v);
  return { bins, peak, range };
}

/**
 * Density above base per channel of a negative's 16-bit counts (linear scanner counts: D = −log10(count / base)).
 * @example densityHistogram(pixels, [0.8, 0.8, 0.78]).bins[1] // green densities 0…3 in 64 bins
 */
export function densityHistogram(pixels: Uint16Array, base: Rgb): Histogram {
  return histogram(DENSITY_SPAN, (add) => {
    for (let i = 0; i < pixels.length; i += 3 * STRIDE)
      for (let c = 0; c < 3; c++) {
        const t = Math.max(1, pixels[i + c]!) / 65535 / base[c]!;
        add(c as 0 | 1 | 2, -Math.log10(t));
      }
  });
}

/**
 * Code values 0…255 per channel of a rendered positive (RGBA).
 * @example positiveHistogram(rgba).bins[0] // red codes in 64 bins
 */
export function positiveHistogram(rgba: Uint8ClampedArray): Histogram {
  return histogram([0, 256], (add) => {
    for (let i = 0; i < rgba.length; i += 4 * STRIDE) {
      add(0, rgba[i]!);
      add(1, rgba[i + 1]!);
      add(2, rgba[i + 2]!);
    }
  });
}
