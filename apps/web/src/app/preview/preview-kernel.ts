import type { InversionPlan } from '@clearbase/inversion';

/**
 * Steps of the grid densities after crosstalk are held on, over the plan's density range (5 D): 0.00008 D a step,
 * under a thousandth of a stop on a γ 0.6 curve, far below one 8-bit code.
 */
const DENSITY_STEPS = 65536;

/**
 * Each pixel's densities after crosstalk (D′ = M·D) as indices into a fine grid over the plan's density range.
 * They depend only on the negative, its base and the crosstalk matrix, so a preview makes them once per matrix and
 * then re-renders balance, curve and tone changes from them with table look-ups alone.
 * @example const indices = quantiseDensities(plan, pixels, width * height); renderQuantised(plan, indices, rgba, width * height);
 */
export function quantiseDensities(plan: InversionPlan, input: Uint16Array, pixelCount: number): Uint16Array {
  const indices = new Uint16Array(pixelCount * 3);
  const { densityLut: dl, crosstalk: m, densityMin: dMin, densityMax: dMax } = plan;
  const scale = (DENSITY_STEPS - 1) / (dMax - dMin);
  const top = DENSITY_STEPS - 1;
  const q = (d: number) => {
    const x = Math.round((d - dMin) * scale);
    return x < 0 ? 0 : x > top ? top : x;
  };
  for (let i = 0; i < pixelCount * 3; i += 3) {
    const r = dl[input[i]!]!,
      g = dl[65536 + input[i + 1]!]!,
      b = dl[131072 + input[i + 2]!]!;
    if (m) {
      indices[i] = q(m[0]! * r + m[1]! * g + m[2]! * b);
      indices[i + 1] = q(m[3]! * r + m[4]! * g + m[5]! * b);
      indices[i + 2] = q(m[6]! * r + m[7]! * g + m[8]! * b);
    } else {
      indices[i] = q(r);
      indices[i + 1] = q(g);
      indices[i + 2] = q(b);
    }
  }
  return indices;
}

/** A plan's relative log exposure per density grid step, per channel (3 × DENSITY_STEPS). */
function exposureByStep(plan: InversionPlan): Float32Array {
  const { exposureLut: el, exposureLutSize: en } = plan;
  const out = new Float32Array(3 * DENSITY_STEPS);
  const toLut = (en - 1) / (DENSITY_STEPS - 1);
  for (let c = 0; c < 3; c++) {
    const base = c * en;
    for (let k = 0; k < DENSITY_STEPS; k++) {
      // the same linear interpolation as the engine's, at the grid step's density
      const x = k * toLut;
      const i = Math.min(en - 2, x | 0);
      out[c * DENSITY_STEPS + k] = el[base + i]! + (x - i) * (el[base + i + 1]! - el[base + i]!);
    }
  }
  return out;
}

/**
 * Renders quantised densities through a plan's exposure and output tables into 8-bit RGBA (alpha 255). With
 * saturation 1 every channel folds into one table of output codes; otherwise saturation mixes per pixel.
 * @example renderQuantised(planFor(profile), indices, new Uint8ClampedArray(width * height * 4), width * height)
 */
export function renderQuantised(
  plan: InversionPlan,
  indices: Uint16Array,
  rgba: Uint8ClampedArray,
  pixelCount: number,
): void {
  const e = exposureByStep(plan);
  const { outputLut: ol, outputLutSize: on, relativeMin: rMin, relativeMax: rMax, saturation: s } = plan;
  const rScale = (on - 1) / (rMax - rMin);
  // nearest entry of the output table: its steps are far finer than an 8-bit code
  // (the table may run past 0…255, the smooth curve beyond black and white: a clamped array clips and rounds)
  const rounded = Uint8ClampedArray.from(ol);
  const last = on - 1;
  const out = (v: number): number => {
    const x = (v - rMin) * rScale;
    return rounded[x <= 0 ? 0 : x >= last ? last : (x + 0.5) | 0]!;
  };
  const g0 = DENSITY_STEPS,
    b0 = 2 * DENSITY_STEPS;
  if (plan.primaries) {
    renderWithPrimaries(plan, plan.primaries, e, indices, rgba, pixelCount, out);
    return;
  }
  if (s === 1) {
    const codes = new Uint8Array(3 * DENSITY_STEPS);
    for (let k = 0; k < codes.length; k++) codes[k] = out(e[k]!);
    for (let p = 0, i = 0, o = 0; p < pixelCount; p++, i += 3, o += 4) {
      rgba[o] = codes[indices[i]!]!;
      rgba[o + 1] = codes[g0 + indices[i + 1]!]!;
      rgba[o + 2] = codes[b0 + indices[i + 2]!]!;
      rgba[o + 3] = 255;
    }
    return;
  }
  const [wr, wg, wb] = plan.weights;
  for (let p = 0, i = 0, o = 0; p < pixelCount; p++, i += 3, o += 4) {
    const er = e[indices[i]!]!,
      eg = e[g0 + indices[i + 1]!]!,
      eb = e[b0 + indices[i + 2]!]!;
    const mean = wr * er + wg * eg + wb * eb;
    rgba[o] = out(mean + s * (er - mean));
    rgba[o + 1] = out(mean + s * (eg - mean));
    rgba[o + 2] = out(mean + s * (eb - mean));
    rgba[o + 3] = 255;
  }
}

/**
 * The change of primaries per pixel, as the engine's: relative log exposures to linear light (grey = 1), the
 * matrix, back to log with a component at or below zero held to the range's floor, then saturation and output.
 */
function renderWithPrimaries(
  plan: InversionPlan,
  p: Float64Array,
  e: Float32Array,
  indices: Uint16Array,
  rgba: Uint8ClampedArray,
  pixelCount: number,
  out: (v: number) => number,
): void {
  const linear = new Float64Array(e.length);
  for (let k = 0; k < e.length; k++) linear[k] = 10 ** e[k]!;
  const { relativeMin: rMin, relativeMax: rMax, saturation: s } = plan;
  const [wr, wg, wb] = plan.weights;
  const floor = 10 ** rMin;
  const toLog = (v: number) => {
    const l = Math.log10(v > floor ? v : floor);
    return l < rMax ? l : rMax;
  };
  const g0 = DENSITY_STEPS,
    b0 = 2 * DENSITY_STEPS;
  for (let q = 0, i = 0, o = 0; q < pixelCount; q++, i += 3, o += 4) {
    const lr = linear[indices[i]!]!,
      lg = linear[g0 + indices[i + 1]!]!,
      lb = linear[b0 + indices[i + 2]!]!;
    const er = toLog(p[0]! * lr + p[1]! * lg + p[2]! * lb),
      eg = toLog(p[3]! * lr + p[4]! * lg + p[5]! * lb),
      eb = toLog(p[6]! * lr + p[7]! * lg + p[8]! * lb);
    const mean = wr * er + wg * eg + wb * eb;
    rgba[o] = out(mean + s * (er - mean));
    rgba[o + 1] = out(mean + s * (eg - mean));
    rgba[o + 2] = out(mean + s * (eb - mean));
    rgba[o + 3] = 255;
  }
}
