import type { InversionPlan, Rgb } from './inversion-plan';

// Percentiles taken as shadow and highlight, ignoring specks and dust; common practice, from memory.
const LOW = 0.005;
const HIGH = 0.995;

/**
 * Shadow and highlight densities (above base, after crosstalk) of a frame, per channel, from
 * about 200 000 sampled pixels.
 */
export function densityLevels(plan: Pick<InversionPlan, 'densityLut' | 'crosstalk'>, data: Uint16Array): { shadow: Rgb; highlight: Rgb } {
  const pixels = data.length / 3;
  const step = Math.max(1, Math.floor(pixels / 200_000));
  const ch = [new Float32Array(Math.ceil(pixels / step)), new Float32Array(Math.ceil(pixels / step)), new Float32Array(Math.ceil(pixels / step))] as const;
  const d = plan.densityLut, m = plan.crosstalk;
  let n = 0;
  for (let p = 0; p < pixels; p += step, n++) {
    const i = p * 3;
    const r = d[data[i]!]!, g = d[65536 + data[i + 1]!]!, b = d[131072 + data[i + 2]!]!;
    ch[0][n] = m ? m[0]! * r + m[1]! * g + m[2]! * b : r;
    ch[1][n] = m ? m[3]! * r + m[4]! * g + m[5]! * b : g;
    ch[2][n] = m ? m[6]! * r + m[7]! * g + m[8]! * b : b;
  }
  const shadow = [0, 0, 0] as Rgb, highlight = [0, 0, 0] as Rgb;
  for (let c = 0; c < 3; c++) {
    const s = ch[c]!.subarray(0, n).sort();
    // Thin negative = deep shadow; dense negative = highlight.
    shadow[c] = s[Math.floor(LOW * (n - 1))]!;
    highlight[c] = s[Math.floor(HIGH * (n - 1))]!;
  }
  return { shadow, highlight };
}

/** Roll-wide levels: the per-channel median of the frames' shadow and highlight densities. */
export function rollLevels(frames: { shadow: Rgb; highlight: Rgb }[]): { shadow: Rgb; highlight: Rgb } {
  const med = (v: number[]) => [...v].sort((a, b) => a - b)[v.length >> 1]!;
  const pick = (k: 'shadow' | 'highlight') => [0, 1, 2].map((c) => med(frames.map((f) => f[k][c]!))) as Rgb;
  return { shadow: pick('shadow'), highlight: pick('highlight') };
}
