import {
  DENSITY_RANGE,
  RELATIVE_LOG_EXPOSURE_RANGE,
  LUMINANCE_WEIGHTS,
  resolveInversion,
  type InversionParams,
} from './invert-pixel';
import { densityTable, exposureTable, EXPOSURE_TABLE_SIZE } from './inversion-tables';

/**
 * Entries of the log exposure → output table over the 9 log units of the relative range (0.0011 log E a step).
 * The table holds the unclipped, smooth output curve and codes are clipped after interpolation, so there is no
 * kink to resolve: the interpolation error stays under 0.01 of a 16-bit code (sized by the equality test).
 */
const OUTPUT_LUT_SIZE = 8192;

/**
 * A compiled inversion: plain data and typed arrays only, so it survives structuredClone / postMessage.
 * Per pixel: D = densityLut[c·65536 + count]; D' = M·D; e = interp(exposureLut, D'); the change of primaries (when
 * the film's are not sRGB); saturation; code = clip(interp(outputLut, e), 0, max code).
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
  /**
   * Row-major 3×3 from the film's capture primaries to linear sRGB, applied in linear light (10^e) after the exposure
   * table, or null when the film records in sRGB primaries. It mixes exposures, not densities, so it cannot fold into
   * the crosstalk matrix; a plan with it has no `directLut` and no `foldedLut`. Absent (older plans) reads as null.
   */
  primaries?: Float64Array | null;
  /** Saturation factor in log exposure around the luminance-weighted mean; 1 = none. */
  saturation: number;
  weights: [number, number, number];
  /**
   * outputLutSize output code values (not rounded) over relativeMin…relativeMax. They may run past 0…max code
   * (the smooth curve beyond black and white): `applyInversion` clips after interpolating.
   */
  outputLut: Float32Array;
  outputLutSize: number;
  relativeMin: number;
  relativeMax: number;
  /** When every stage is per channel (identity crosstalk, saturation 1): 3 × 65536 output codes by count, else null. */
  directLut: Uint16Array | null;
  /**
   * When saturation is 1 (always so in reference rendering): the exposure and output tables composed, 3 ×
   * exposureLutSize output codes (not rounded, not clipped) by density after crosstalk over densityMin…densityMax,
   * so a pixel needs one interpolation a channel instead of two; else null. Describes `exposureLut` and
   * `outputLut`: a plan derived from another with new tables must set it to null (or recompose it).
   */
  foldedLut: Float32Array | null;
  /**
   * An 8-bit plan's `foldedLut` rounded and clipped to codes, read at the nearest entry instead of interpolated: an
   * entry is 0.00015 D wide, so the nearest one is off by well under a tenth of a code and the pixel stays within one
   * code of the plain path (tested). A third of the table path's time a pixel (bench/README.md). Null when
   * `foldedLut` is, or for 16-bit plans; absent (older plans) reads as null. Describes `foldedLut` as it does.
   */
  codeLut?: Uint8Array | null;
}

/**
 * Compiles params into lookup tables for `applyInversion`: about 0.3 million table entries, a few milliseconds.
 * Throws a RangeError (see `assertInversionParams`) before any work on invalid params.
 * @example const plan = compileInversion(params); applyInversion(plan, input, output, 0, width * height);
 */
export function compileInversion(params: InversionParams): InversionPlan {
  const resolved = resolveInversion(params);
  const [dMin, dMax] = DENSITY_RANGE;
  const [rMin, rMax] = RELATIVE_LOG_EXPOSURE_RANGE;
  const m = resolved.crosstalk;
  const identity = m.every((row, r) => row.every((x, k) => x === (r === k ? 1 : 0)));
  const outputLut = new Float32Array(OUTPUT_LUT_SIZE);
  for (let i = 0; i < OUTPUT_LUT_SIZE; i++)
    outputLut[i] = resolved.encodeUnclipped(rMin + ((rMax - rMin) * i) / (OUTPUT_LUT_SIZE - 1));
  const plan: InversionPlan = {
    outputBits: params.outputBits,
    densityLut: densityTable(params.scanner, params.base),
    crosstalk: identity ? null : Float32Array.from(m.flat()),
    exposureLut: exposureTable(resolved, JSON.stringify(params.profile.curves)),
    exposureLutSize: EXPOSURE_TABLE_SIZE,
    densityMin: dMin,
    densityMax: dMax,
    primaries: resolved.primaries ? Float64Array.from(resolved.primaries.flat()) : null,
    saturation: resolved.saturation,
    weights: [...LUMINANCE_WEIGHTS],
    outputLut,
    outputLutSize: OUTPUT_LUT_SIZE,
    relativeMin: rMin,
    relativeMax: rMax,
    directLut: null,
    foldedLut: null,
    codeLut: null,
  };
  if (plan.primaries) return plan;
  if (resolved.saturation === 1) {
    plan.foldedLut = composeTables(plan);
    if (params.outputBits === 8) plan.codeLut = roundedCodes(plan.foldedLut, 255);
  }
  if (identity && resolved.saturation === 1) {
    // Every stage is per channel: fold the whole chain into one table per channel, through the same tables.
    const direct = new Uint16Array(3 * 65536);
    const { densityLut: dl, exposureLut: el, exposureLutSize: en } = plan;
    const dScale = (en - 1) / (dMax - dMin),
      rScale = (OUTPUT_LUT_SIZE - 1) / (rMax - rMin);
    for (let c = 0; c < 3; c++) {
      for (let v = c * 65536; v < (c + 1) * 65536; v++) {
        const e = lerp(el, c * en, (dl[v]! - dMin) * dScale, en - 1 - 1e-6);
        direct[v] = code(
          lerp(outputLut, 0, (e - rMin) * rScale, OUTPUT_LUT_SIZE - 1 - 1e-6),
          resolved.maxCode,
        );
      }
    }
    plan.directLut = direct;
  }
  return plan;
}

/**
 * Inverts pixels [firstPixel, firstPixel + pixelCount) of interleaved 16-bit RGB `input` into `output`
 * (same pixel indices; Uint8Array for 8-bit plans, Uint16Array for 16-bit). Workers may split rows.
 * No allocation per pixel: table lookups, the 3×3 crosstalk and saturation in one pass over typed arrays.
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
  const start = firstPixel * 3,
    end = (firstPixel + pixelCount) * 3;
  if (plan.primaries) {
    invertWithPrimaries(plan, plan.primaries, input, output, start, end);
    return;
  }
  const direct = plan.directLut;
  if (direct) {
    for (let i = start; i < end; i += 3) {
      output[i] = direct[input[i]!]!;
      output[i + 1] = direct[65536 + input[i + 1]!]!;
      output[i + 2] = direct[131072 + input[i + 2]!]!;
    }
    return;
  }
  if (plan.codeLut && output instanceof Uint8Array && plan.saturation === 1)
    invertNearestCode(plan, plan.codeLut, input, output, start, end);
  else if (plan.foldedLut && plan.saturation === 1)
    invertFolded(plan, plan.foldedLut, input, output, start, end);
  else invertTables(plan, input, output, start, end);
}

/** The output table sampled at each exposure table entry: output code by density after crosstalk, per channel. */
function composeTables(plan: InversionPlan): Float32Array {
  const el = plan.exposureLut,
    ol = plan.outputLut;
  const rMin = plan.relativeMin,
    rScale = (plan.outputLutSize - 1) / (plan.relativeMax - rMin),
    oTop = plan.outputLutSize - 1 - 1e-6;
  const folded = new Float32Array(el.length);
  for (let i = 0; i < el.length; i++) folded[i] = lerp(ol, 0, (el[i]! - rMin) * rScale, oTop);
  return folded;
}

/**
 * The crosstalk (identity for a plan without one) scaled to exposure-table steps, then the fractional index of
 * density `densityMin`: each channel's index into the exposure table is then one dot product plus that offset.
 */
function crosstalkInSteps(
  plan: InversionPlan,
): [number, number, number, number, number, number, number, number, number, number] {
  const dMin = plan.densityMin,
    dScale = (plan.exposureLutSize - 1) / (plan.densityMax - dMin);
  const m = plan.crosstalk ?? IDENTITY;
  return [
    m[0]! * dScale,
    m[1]! * dScale,
    m[2]! * dScale,
    m[3]! * dScale,
    m[4]! * dScale,
    m[5]! * dScale,
    m[6]! * dScale,
    m[7]! * dScale,
    m[8]! * dScale,
    -dMin * dScale,
  ];
}

const IDENTITY = new Float32Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);

/** Each value of a table of unrounded codes clipped to 0…maxCode and rounded, as `code` does per pixel. */
function roundedCodes(table: Float32Array, maxCode: number): Uint8Array {
  const codes = new Uint8Array(table.length);
  for (let i = 0; i < table.length; i++) codes[i] = code(table[i]!, maxCode);
  return codes;
}

/**
 * The 8-bit table path with saturation 1 through the composed table's codes: densities, crosstalk, the nearest entry.
 * No interpolation and a table of a quarter the bytes (96 KB against 384 KB, which stays in cache).
 */
function invertNearestCode(
  plan: InversionPlan,
  codes: Uint8Array,
  input: Uint16Array,
  output: Uint8Array,
  start: number,
  end: number,
): void {
  const dl = plan.densityLut;
  const n = plan.exposureLutSize,
    top = n - 1,
    n2 = 2 * n;
  const [m0, m1, m2, m3, m4, m5, m6, m7, m8, start0] = crosstalkInSteps(plan);
  // Half a step added, so truncating the index picks the nearest entry.
  const off = 0.5 + start0;
  for (let i = start; i < end; i += 3) {
    const d0 = dl[input[i]!]!,
      d1 = dl[65536 + input[i + 1]!]!,
      d2 = dl[131072 + input[i + 2]!]!;
    // Clamps by conditional moves as in invertFolded (NaN goes to the table's start).
    let x = m0 * d0 + m1 * d1 + m2 * d2 + off;
    x = x > 0 ? x : 0;
    output[i] = codes[(x < top ? x : top) | 0]!;
    x = m3 * d0 + m4 * d1 + m5 * d2 + off;
    x = x > 0 ? x : 0;
    output[i + 1] = codes[((x < top ? x : top) | 0) + n]!;
    x = m6 * d0 + m7 * d1 + m8 * d2 + off;
    x = x > 0 ? x : 0;
    output[i + 2] = codes[((x < top ? x : top) | 0) + n2]!;
  }
}

/** The table path with saturation 1 through the composed table: densities, crosstalk, one interpolation, clip. */
function invertFolded(
  plan: InversionPlan,
  table: Float32Array,
  input: Uint16Array,
  output: Uint8Array | Uint16Array,
  start: number,
  end: number,
): void {
  const dl = plan.densityLut;
  const n = plan.exposureLutSize,
    top = n - 1 - 1e-6,
    n2 = 2 * n;
  const maxCode = plan.outputBits === 8 ? 255 : 65535;
  const [m0, m1, m2, m3, m4, m5, m6, m7, m8, off] = crosstalkInSteps(plan);
  for (let i = start; i < end; i += 3) {
    const d0 = dl[input[i]!]!,
      d1 = dl[65536 + input[i + 1]!]!,
      d2 = dl[131072 + input[i + 2]!]!;
    // Written out by hand as in invertTables: no calls in the loop, clamps by conditional moves.
    let x = m0 * d0 + m1 * d1 + m2 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < top ? x : top;
    let k = x | 0;
    let v = table[k]! + (x - k) * (table[k + 1]! - table[k]!);
    output[i] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
    x = m3 * d0 + m4 * d1 + m5 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < top ? x : top;
    k = (x | 0) + n;
    v = table[k]! + (x + n - k) * (table[k + 1]! - table[k]!);
    output[i + 1] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
    x = m6 * d0 + m7 * d1 + m8 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < top ? x : top;
    k = (x | 0) + n2;
    v = table[k]! + (x + n2 - k) * (table[k + 1]! - table[k]!);
    output[i + 2] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
  }
}

/** The table path over samples [start, end) of `input`: densities, crosstalk, exposure, saturation, output. */
function invertTables(
  plan: InversionPlan,
  input: Uint16Array,
  output: Uint8Array | Uint16Array,
  start: number,
  end: number,
): void {
  const dl = plan.densityLut,
    el = plan.exposureLut,
    ol = plan.outputLut;
  const eLast = plan.exposureLutSize - 1,
    oLast = plan.outputLutSize - 1,
    eTop = eLast - 1e-6,
    oTop = oLast - 1e-6;
  const e1 = plan.exposureLutSize,
    e2 = 2 * plan.exposureLutSize;
  const dMin = plan.densityMin,
    dScale = eLast / (plan.densityMax - dMin);
  const rMin = plan.relativeMin,
    rScale = oLast / (plan.relativeMax - rMin);
  const maxCode = plan.outputBits === 8 ? 255 : 65535;
  const s = plan.saturation;
  const wr = plan.weights[0],
    wg = plan.weights[1],
    wb = plan.weights[2];
  const m = plan.crosstalk;
  const m0 = m ? m[0]! : 1,
    m1 = m ? m[1]! : 0,
    m2 = m ? m[2]! : 0,
    m3 = m ? m[3]! : 0,
    m4 = m ? m[4]! : 1,
    m5 = m ? m[5]! : 0,
    m6 = m ? m[6]! : 0,
    m7 = m ? m[7]! : 0,
    m8 = m ? m[8]! : 1;
  for (let i = start; i < end; i += 3) {
    const d0 = dl[input[i]!]!,
      d1 = dl[65536 + input[i + 1]!]!,
      d2 = dl[131072 + input[i + 2]!]!;
    const r = m0 * d0 + m1 * d1 + m2 * d2,
      g = m3 * d0 + m4 * d1 + m5 * d2,
      b = m6 * d0 + m7 * d1 + m8 * d2;
    // The six interpolations are written out by hand so the loop holds no calls whatever the JIT decides;
    // each clamps its fractional index with two conditional moves (NaN goes to the table's start).
    let x = (r - dMin) * dScale;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    let k = x | 0;
    const er = el[k]! + (x - k) * (el[k + 1]! - el[k]!);
    x = (g - dMin) * dScale;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    k = (x | 0) + e1;
    const eg = el[k]! + (x + e1 - k) * (el[k + 1]! - el[k]!);
    x = (b - dMin) * dScale;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    k = (x | 0) + e2;
    const eb = el[k]! + (x + e2 - k) * (el[k + 1]! - el[k]!);
    // Saturation always applied (s = 1 leaves e as it is to the last bit or two): no branch in the loop.
    const mean = (1 - s) * (wr * er + wg * eg + wb * eb);
    x = (mean + s * er - rMin) * rScale;
    x = x > 0 ? x : 0;
    x = x < oTop ? x : oTop;
    k = x | 0;
    let v = ol[k]! + (x - k) * (ol[k + 1]! - ol[k]!);
    output[i] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
    x = (mean + s * eg - rMin) * rScale;
    x = x > 0 ? x : 0;
    x = x < oTop ? x : oTop;
    k = x | 0;
    v = ol[k]! + (x - k) * (ol[k + 1]! - ol[k]!);
    output[i + 1] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
    x = (mean + s * eb - rMin) * rScale;
    x = x > 0 ? x : 0;
    x = x < oTop ? x : oTop;
    k = x | 0;
    v = ol[k]! + (x - k) * (ol[k + 1]! - ol[k]!);
    output[i + 2] = v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
  }
}

/**
 * Entries of the table of log2 of a double's mantissa, 1 + f for f in [0, 1]: 4096 steps, linearly interpolated,
 * err by under 2e-8 (h²/8 · max |log2''| = 2^-24 / 8 · 1.44); the mantissa's bits below the top 20 are dropped,
 * under 1.4e-6 in log2, far under a 16-bit code (sized by the equality test).
 */
const MANTISSA_STEPS = 4096;
const MANTISSA_SCALE = MANTISSA_STEPS / 0x100000;
/** log10 2, to turn log2 into log10. */
const LOG10_2 = Math.log10(2);
const MANTISSA_LOG2 = Float64Array.from({ length: MANTISSA_STEPS + 2 }, (_, i) =>
  Math.log2(1 + Math.min(i, MANTISSA_STEPS) / MANTISSA_STEPS),
);

/**
 * The table path with a change of primaries over samples [start, end): densities, crosstalk, exposure, then in linear
 * light (grey = 1) the primaries matrix and back to log (a component at or below zero held to the range's floor, as
 * `applyPrimaries`), saturation, output.
 */
function invertWithPrimaries(
  plan: InversionPlan,
  p: Float64Array,
  input: Uint16Array,
  output: Uint8Array | Uint16Array,
  start: number,
  end: number,
): void {
  const dl = plan.densityLut,
    el = plan.exposureLut,
    ol = plan.outputLut;
  const n = plan.exposureLutSize,
    eTop = n - 1 - 1e-6;
  const rMin = plan.relativeMin,
    rMax = plan.relativeMax,
    rScale = (plan.outputLutSize - 1) / (rMax - rMin),
    oTop = plan.outputLutSize - 1 - 1e-6;
  const floor = 10 ** rMin;
  const s = plan.saturation;
  const [wr, wg, wb] = plan.weights;
  const maxCode = plan.outputBits === 8 ? 255 : 65535;
  const p0 = p[0]!,
    p1 = p[1]!,
    p2 = p[2]!,
    p3 = p[3]!,
    p4 = p[4]!,
    p5 = p[5]!,
    p6 = p[6]!,
    p7 = p[7]!,
    p8 = p[8]!;
  // The exposure table in linear light, made per call (3 × 32768 exponentials, a few milliseconds): the loop then
  // interpolates linear exposure directly, as exact as interpolating the log (the steps are 0.00015 D).
  const linear = new Float64Array(el.length);
  for (let j = 0; j < el.length; j++) linear[j] = 10 ** el[j]!;
  const [m0, m1, m2, m3, m4, m5, m6, m7, m8, off] = crosstalkInSteps(plan);
  const n2 = 2 * n;
  for (let i = start; i < end; i += 3) {
    const d0 = dl[input[i]!]!,
      d1 = dl[65536 + input[i + 1]!]!,
      d2 = dl[131072 + input[i + 2]!]!;
    // The exposure interpolations written out by hand as in invertTables; the logarithms and the output stage
    // by small helpers the JIT inlines (this loop's cost is the table reads and logarithms; measured no slower).
    let x = m0 * d0 + m1 * d1 + m2 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    let k = x | 0;
    const lr = linear[k]! + (x - k) * (linear[k + 1]! - linear[k]!);
    x = m3 * d0 + m4 * d1 + m5 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    k = (x | 0) + n;
    const lg = linear[k]! + (x + n - k) * (linear[k + 1]! - linear[k]!);
    x = m6 * d0 + m7 * d1 + m8 * d2 + off;
    x = x > 0 ? x : 0;
    x = x < eTop ? x : eTop;
    k = (x | 0) + n2;
    const lb = linear[k]! + (x + n2 - k) * (linear[k + 1]! - linear[k]!);
    let er = log10Above(p0 * lr + p1 * lg + p2 * lb, floor);
    let eg = log10Above(p3 * lr + p4 * lg + p5 * lb, floor);
    let eb = log10Above(p6 * lr + p7 * lg + p8 * lb, floor);
    er = er < rMax ? er : rMax;
    eg = eg < rMax ? eg : rMax;
    eb = eb < rMax ? eb : rMax;
    // Saturation always applied (s = 1 leaves e as it is to the last bit or two): no branch in the loop.
    const mean = (1 - s) * (wr * er + wg * eg + wb * eb);
    output[i] = code(lerp(ol, 0, (mean + s * er - rMin) * rScale, oTop), maxCode);
    output[i + 1] = code(lerp(ol, 0, (mean + s * eg - rMin) * rScale, oTop), maxCode);
    output[i + 2] = code(lerp(ol, 0, (mean + s * eb - rMin) * rScale, oTop), maxCode);
  }
}

// One double and its two 32-bit words (little-endian, as every platform the engine runs on): words[1] holds the
// sign, the exponent and the mantissa's top 20 bits. Scratch of `log10Above`.
const BITS = new Float64Array(1),
  WORDS = new Uint32Array(BITS.buffer);

/**
 * log10 of max(v, floor) for a positive floor, by the number's bits: the exponent, plus log2 of the mantissa from a
 * table (see MANTISSA_LOG2). Small enough for the JIT to inline into the pixel loop.
 */
function log10Above(v: number, floor: number): number {
  BITS[0] = v > floor ? v : floor;
  const hi = WORDS[1]!;
  const t = (hi & 0xfffff) * MANTISSA_SCALE;
  const q = t | 0;
  return (
    ((hi >>> 20) - 1023 + MANTISSA_LOG2[q]! + (t - q) * (MANTISSA_LOG2[q + 1]! - MANTISSA_LOG2[q]!)) * LOG10_2
  );
}

/**
 * Linear interpolation in table[base … base + top] at fractional index x, held to the table (NaN to its start).
 * `top` is the last index less a millionth of a step, so the upper neighbour always exists. Used when folding
 * the tables and for the output stage of the pixel loops (small enough for the JIT to inline).
 */
function lerp(table: Float32Array, base: number, x: number, top: number): number {
  x = x > 0 ? x : 0;
  x = x < top ? x : top;
  const k = x | 0;
  const lo = table[base + k]!;
  return lo + (x - k) * (table[base + k + 1]! - lo);
}

/** A code value clipped to 0…maxCode and rounded to nearest (half up, as Math.round for values ≥ 0). */
function code(v: number, maxCode: number): number {
  return v <= 0 ? 0 : v >= maxCode ? maxCode : (v + 0.5) | 0;
}
