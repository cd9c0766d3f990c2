import type { InversionPlan, Rgb } from './inversion-plan';

// Percentiles taken as shadow and highlight, ignoring specks and dust; common practice, from memory.
const LOW = 0.005;
const HIGH = 0.995;

// Histogram of density for the percentiles: 4096 bins over −0.5…4.0 D is 0.0011 D a bin, far finer
// than levels need; sampled pixels: about 2^18 are plenty for 0.5 % tails; from memory.
const BINS = 4096;
const D_MIN = -0.5;
const D_MAX = 4.0;
const SAMPLES = 1 << 18;

/**
 * Shadow and highlight densities (above base, after crosstalk) of a frame, per channel, from a
 * histogram of about 262 000 sampled pixels.
 */
export function densityLevels(
  plan: Pick<InversionPlan, 'densityLut' | 'crosstalk'>,
  data: Uint16Array,
): { shadow: Rgb; highlight: Rgb } {
  const pixels = data.length / 3;
  const step = Math.max(1, Math.floor(pixels / SAMPLES));
  const hist = new Uint32Array(3 * BINS);
  const d = plan.densityLut,
    m = plan.crosstalk;
  const scale = (BINS - 1) / (D_MAX - D_MIN);
  const bin = (x: number) => {
    const q = ((x - D_MIN) * scale + 0.5) | 0;
    return q < 0 ? 0 : q >= BINS ? BINS - 1 : q;
  };
  let n = 0;
  for (let p = 0; p < pixels; p += step, n++) {
    const i = p * 3;
    const r = d[data[i]!]!,
      g = d[65536 + data[i + 1]!]!,
      b = d[131072 + data[i + 2]!]!;
    hist[bin(m ? m[0]! * r + m[1]! * g + m[2]! * b : r)]!++;
    hist[BINS + bin(m ? m[3]! * r + m[4]! * g + m[5]! * b : g)]!++;
    hist[2 * BINS + bin(m ? m[6]! * r + m[7]! * g + m[8]! * b : b)]!++;
  }
  const shadow = [0, 0, 0] as Rgb,
    highlight = [0, 0, 0] as Rgb;
  for (let c = 0; c < 3; c++) {
    // Thin negative = deep shadow; dense negative = highlight.
    shadow[c] = D_MIN + percentileBin(hist, c * BINS, n, LOW) / scale;
    highlight[c] = D_MIN + percentileBin(hist, c * BINS, n, HIGH) / scale;
  }
  return { shadow, highlight };
}

function percentileBin(hist: Uint32Array, offset: number, total: number, fraction: number): number {
  const target = fraction * total;
  let seen = 0;
  for (let k = 0; k < BINS; k++) {
    seen += hist[offset + k]!;
    if (seen > target) return k;
  }
  return BINS - 1;
}

/** Roll-wide levels: the per-channel median of the frames' shadow and highlight densities. */
export function rollLevels(frames: { shadow: Rgb; highlight: Rgb }[]): { shadow: Rgb; highlight: Rgb } {
  const med = (v: number[]) => [...v].sort((a, b) => a - b)[v.length >> 1]!;
  const pick = (k: 'shadow' | 'highlight') => [0, 1, 2].map((c) => med(frames.map((f) => f[k][c]!))) as Rgb;
  return { shadow: pick('shadow'), highlight: pick('highlight') };
}
