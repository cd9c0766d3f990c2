import {
  DENSITY_RANGE,
  RELATIVE_LOG_EXPOSURE_RANGE,
  LUMINANCE_WEIGHTS,
  resolveInversion,
  type InversionParams,
} from './invert-pixel';
import { densityAboveBase } from './density';
import { linearise, FULL_SCALE_16 } from './scanner-input';

/** Entries of the density → log exposure table: 32768 over 5 D is 0.00015 D a step, linearly interpolated (sized by the equality test). */
const EXPOSURE_LUT_SIZE = 32768;
/** Entries of the log exposure → output table: 262144 over 9 log units, linearly interpolated; fine enough that the
 * kink at the white clip stays within one 16-bit code (sized by the equality test). */
const OUTPUT_LUT_SIZE = 262144;

/**
 * A compiled inversion: plain data and typed arrays only, so it survives structuredClone / postMessage.
 * Per pixel: D = densityLut[c·65536 + count]; D' = M·D; e = interp(exposureLut, D'); saturation; code = interp(outputLut, e).
 */
export interface InversionPlan {
  outputBits: 8 | 16;
  /** 3 × 65536 densities above base by channel and 16-bit count, held to the density range. */
  densityLut: Float32Array;
  /** Row-major 3×3 crosstalk, or null for identity. */
  crosstalk: Float32Array | null;
  /** 3 × exposureLutSize relative log exposures (balance, exposure and E_mid applied) over densityMin…densityMax. */
  exposureLut: Float32Array;
  exposureLutSize: number;
  densityMin: number;
  densityMax: number;
  /** Saturation factor in log exposure around the luminance-weighted mean; 1 = none. */
  saturation: number;
  weights: [number, number, number];
  /** outputLutSize output code values (not rounded) over relativeMin…relativeMax. */
  outputLut: Float32Array;
  outputLutSize: number;
  relativeMin: number;
  relativeMax: number;
  /** When every stage is per channel (identity crosstalk, saturation 1): 3 × 65536 output codes by count, else null. */
  directLut: Uint16Array | null;
}

/**
 * Compiles params into lookup tables for `applyInversion`.
 * @example const plan = compileInversion(params); applyInversion(plan, input, output, 0, width * height);
 */
export function compileInversion(params: InversionParams): InversionPlan {
  const resolved = resolveInversion(params);
  const [dMin, dMax] = DENSITY_RANGE;
  const [rMin, rMax] = RELATIVE_LOG_EXPOSURE_RANGE;
  const densityLut = new Float32Array(3 * 65536);
  for (let c = 0; c < 3; c++) {
    for (let v = 0; v < 65536; v++) {
      const d = densityAboveBase(
        linearise(v / FULL_SCALE_16, params.scanner, c as 0 | 1 | 2),
        params.base[c]!,
      );
      densityLut[c * 65536 + v] = d < dMin ? dMin : d > dMax ? dMax : d;
    }
  }
  const m = resolved.crosstalk;
  const identity = m.every((row, r) => row.every((x, k) => x === (r === k ? 1 : 0)));
  const exposureLut = new Float32Array(3 * EXPOSURE_LUT_SIZE);
  for (let c = 0; c < 3; c++) {
    for (let i = 0; i < EXPOSURE_LUT_SIZE; i++) {
      const d = dMin + ((dMax - dMin) * i) / (EXPOSURE_LUT_SIZE - 1);
      const e = resolved.curves[c]!.inverse(d) + resolved.offset[c]!;
      exposureLut[c * EXPOSURE_LUT_SIZE + i] = e < rMin ? rMin : e > rMax ? rMax : e;
    }
  }
  const outputLut = new Float32Array(OUTPUT_LUT_SIZE);
  for (let i = 0; i < OUTPUT_LUT_SIZE; i++)
    outputLut[i] = resolved.encode(rMin + ((rMax - rMin) * i) / (OUTPUT_LUT_SIZE - 1));
  const plan: InversionPlan = {
    outputBits: params.outputBits,
    densityLut,
    crosstalk: identity ? null : Float32Array.from(m.flat()),
    exposureLut,
    exposureLutSize: EXPOSURE_LUT_SIZE,
    densityMin: dMin,
    densityMax: dMax,
    saturation: resolved.saturation,
    weights: [...LUMINANCE_WEIGHTS],
    outputLut,
    outputLutSize: OUTPUT_LUT_SIZE,
    relativeMin: rMin,
    relativeMax: rMax,
    directLut: null,
  };
  if (identity && resolved.saturation === 1) {
    // Every stage is per channel: fold the whole chain into one table per channel, through the same tables.
    const direct = new Uint16Array(3 * 65536);
    const e = new Float64Array(3);
    for (let v = 0; v < 65536; v++) {
      e[0] = densityLut[v]!;
      e[1] = densityLut[65536 + v]!;
      e[2] = densityLut[131072 + v]!;
      pixelFromDensities(plan, e);
      direct[v] = e[0]!;
      direct[65536 + v] = e[1]!;
      direct[131072 + v] = e[2]!;
    }
    plan.directLut = direct;
  }
  return plan;
}

/**
 * Inverts pixels [firstPixel, firstPixel + pixelCount) of interleaved 16-bit RGB `input` into `output`
 * (same pixel indices; Uint8Array for 8-bit plans, Uint16Array for 16-bit). Workers may split rows.
 * Throws a RangeError, before any work, for a range outside the input or an output of the wrong kind.
 * @example applyInversion(plan, input, output, row * width, width) // one row
 */
export function applyInversion(
  plan: InversionPlan,
  input: Uint16Array,
  output: Uint8Array | Uint16Array,
  firstPixel: number,
  pixelCount: number,
): void {
  const pixels = Math.floor(input.length / 3);
  if (!Number.isInteger(firstPixel) || firstPixel < 0 || firstPixel > pixels)
    throw new RangeError(
      `Expected integer between 0 and ${pixels} for firstPixel but received ${firstPixel} of type ${typeof firstPixel}`,
    );
  if (!Number.isInteger(pixelCount) || pixelCount < 0 || firstPixel + pixelCount > pixels)
    throw new RangeError(
      `Expected integer between 0 and ${pixels - firstPixel} for pixelCount but received ${pixelCount} of type ${typeof pixelCount}`,
    );
  if (output.length < input.length)
    throw new RangeError(`Expected output of at least ${input.length} values but received ${output.length}`);
  if ((plan.outputBits === 8) !== output instanceof Uint8Array)
    throw new RangeError(
      `Expected ${plan.outputBits === 8 ? 'Uint8Array' : 'Uint16Array'} for output of a ${plan.outputBits}-bit plan but received ${output.constructor.name}`,
    );
  const end = (firstPixel + pixelCount) * 3;
  const direct = plan.directLut;
  if (direct) {
    for (let i = firstPixel * 3; i < end; i += 3) {
      output[i] = direct[input[i]!]!;
      output[i + 1] = direct[65536 + input[i + 1]!]!;
      output[i + 2] = direct[131072 + input[i + 2]!]!;
    }
    return;
  }
  const {
    densityLut: dl,
    crosstalk: m,
    exposureLut: el,
    exposureLutSize: en,
    outputLut: ol,
    outputLutSize: on,
    saturation: s,
  } = plan;
  const dMin = plan.densityMin,
    dMax = plan.densityMax,
    rMin = plan.relativeMin,
    rMax = plan.relativeMax;
  const dScale = (en - 1) / (dMax - dMin);
  const rScale = (on - 1) / (rMax - rMin);
  const [wr, wg, wb] = plan.weights;
  const expo = (d: number, base: number): number => {
    if (d <= dMin) return el[base]!;
    if (d >= dMax) return el[base + en - 1]!;
    const x = (d - dMin) * dScale;
    const i = x | 0;
    return el[base + i]! + (x - i) * (el[base + i + 1]! - el[base + i]!);
  };
  const out = (e: number): number => {
    if (e <= rMin) return Math.round(ol[0]!);
    if (e >= rMax) return Math.round(ol[on - 1]!);
    const x = (e - rMin) * rScale;
    const i = x | 0;
    return Math.round(ol[i]! + (x - i) * (ol[i + 1]! - ol[i]!));
  };
  for (let i = firstPixel * 3; i < end; i += 3) {
    let r = dl[input[i]!]!;
    let g = dl[65536 + input[i + 1]!]!;
    let b = dl[131072 + input[i + 2]!]!;
    if (m) {
      const r2 = m[0]! * r + m[1]! * g + m[2]! * b;
      const g2 = m[3]! * r + m[4]! * g + m[5]! * b;
      b = m[6]! * r + m[7]! * g + m[8]! * b;
      r = r2;
      g = g2;
    }
    let er = expo(r, 0),
      eg = expo(g, en),
      eb = expo(b, 2 * en);
    if (s !== 1) {
      const mean = wr * er + wg * eg + wb * eb;
      er = mean + s * (er - mean);
      eg = mean + s * (eg - mean);
      eb = mean + s * (eb - mean);
    }
    output[i] = out(er);
    output[i + 1] = out(eg);
    output[i + 2] = out(eb);
  }
}

/** Densities after crosstalk (in `e`) → rounded output codes (in `e`): exposure tables, saturation, output table. */
function pixelFromDensities(plan: InversionPlan, e: Float64Array): void {
  const { exposureLut: el, exposureLutSize: en, outputLut: ol, outputLutSize: on, saturation: s } = plan;
  const dMin = plan.densityMin,
    dMax = plan.densityMax,
    rMin = plan.relativeMin,
    rMax = plan.relativeMax;
  const dScale = (en - 1) / (dMax - dMin);
  const rScale = (on - 1) / (rMax - rMin);
  for (let c = 0; c < 3; c++) {
    const d = e[c]!;
    const base = c * en;
    let v: number;
    if (d <= dMin) v = el[base]!;
    else if (d >= dMax) v = el[base + en - 1]!;
    else {
      const x = (d - dMin) * dScale;
      const k = x | 0;
      v = el[base + k]! + (x - k) * (el[base + k + 1]! - el[base + k]!);
    }
    e[c] = v;
  }
  if (s !== 1) {
    const mean = plan.weights[0] * e[0]! + plan.weights[1] * e[1]! + plan.weights[2] * e[2]!;
    for (let c = 0; c < 3; c++) e[c] = mean + s * (e[c]! - mean);
  }
  for (let c = 0; c < 3; c++) {
    const v = e[c]!;
    if (v <= rMin) e[c] = Math.round(ol[0]!);
    else if (v >= rMax) e[c] = Math.round(ol[on - 1]!);
    else {
      const x = (v - rMin) * rScale;
      const k = x | 0;
      e[c] = Math.round(ol[k]! + (x - k) * (ol[k + 1]! - ol[k]!));
    }
  }
}
