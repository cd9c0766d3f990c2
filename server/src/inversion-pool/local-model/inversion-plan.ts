import type { ScannerProfile, StockProfile } from './stock-profile';

export type Rgb = [number, number, number];

export interface InversionParams {
  stock: StockProfile;
  scanner: ScannerProfile;
  /** Film base as linear transmitted light, 0–1 of full scale, per channel. */
  base: Rgb;
  /** Densities above base (after crosstalk) taken as the deepest shadow and the brightest highlight, per channel. */
  levels: { shadow: Rgb; highlight: Rgb };
  /** Roll/frame cast in printer points on the red, green and blue channels of the positive. */
  points?: Rgb;
  exposureStops?: number;
  render: 'print' | 'reference';
  output: 'u8' | 'u16';
}

/** Lookup tables and a matrix: everything a worker needs, structured-cloneable. */
export interface InversionPlan {
  output: 'u8' | 'u16';
  /** 3 × 65536 densities above base, indexed by channel × 65536 + count. */
  densityLut: Float32Array;
  /** Row-major 3×3 crosstalk, or null for identity. */
  crosstalk: Float32Array | null;
  /** 3 × OUT_SIZE output code values, indexed by quantised density. */
  outputLut: Uint16Array;
  /** Without crosstalk every stage is per channel: 3 × 65536 output values indexed by count. */
  directLut: Uint16Array | null;
  densityMin: number;
  densityScale: number;
}

// Quantisation of density for the output tables: 16384 steps over −0.5…4.0 is 0.00027 D, below
// one 16-bit code value at γ 0.6; common practice of the trade, from memory (LUT sizing).
const OUT_SIZE = 16384;
const DENSITY_MIN = -0.5;
const DENSITY_MAX = 4.0;
// 1 printer point = 0.025 log exposure (design notes; common practice of the trade).
const LOG_EXPOSURE_PER_POINT = 0.025;
// 1 stop = log10 2 (ISO 5-2 / design notes).
const LOG_EXPOSURE_PER_STOP = Math.log10(2);
// Highlight reflectance the highlight level maps to; a diffuse white, from memory.
const WHITE = 0.9;

function linearise(v: number, scanner: ScannerProfile): number {
  let x = v;
  if (scanner.encoding === 'srgb')
    x = x <= 0.04045 ? x / 12.92 : ((x + 0.055) / 1.055) ** 2.4; // IEC 61966-2-1
  else if (scanner.encoding === 'gamma') x = x ** scanner.gamma;
  return (x - scanner.blackLevel) / (1 - scanner.blackLevel);
}

function srgbEncode(y: number): number {
  const v = y <= 0.0031308 ? 12.92 * y : 1.055 * y ** (1 / 2.4) - 0.055; // IEC 61966-2-1
  return Math.min(1, Math.max(0, v));
}

/** Density above base of one channel for every 16-bit count. */
export function densityTable(base: number, scanner: ScannerProfile): Float32Array {
  const lut = new Float32Array(65536);
  const floor = 1 / 65536;
  for (let code = 0; code < 65536; code++) {
    const light = Math.max(floor, linearise(code / 65535, scanner));
    lut[code] = Math.log10(Math.max(floor, base) / light);
  }
  return lut;
}

/** The density stage of a plan: counts → density above base, and the crosstalk matrix. */
export interface DensityStage {
  densityLut: Float32Array;
  crosstalk: Float32Array | null;
}

/** Compiles the density stage alone; measuring levels needs it before the rest of the plan. */
export function compileDensity(params: Pick<InversionParams, 'base' | 'scanner' | 'stock'>): DensityStage {
  const densityLut = new Float32Array(3 * 65536);
  for (let c = 0; c < 3; c++) densityLut.set(densityTable(params.base[c]!, params.scanner), c * 65536);
  const m = params.stock.crosstalk;
  const identity = !m || m.every((v, i) => v === (i % 4 === 0 ? 1 : 0));
  return { densityLut, crosstalk: identity ? null : Float32Array.from(m) };
}

/**
 * Compiles the parameters of one frame into lookup tables. Pass `density` when it was already
 * compiled for the same base, scanner and stock.
 */
export function compileInversion(
  params: InversionParams,
  density: DensityStage = compileDensity(params),
): InversionPlan {
  const { densityLut, crosstalk } = density;
  const outputLut = new Uint16Array(3 * OUT_SIZE);
  const full = params.output === 'u8' ? 255 : 65535;
  const points = params.points ?? [0, 0, 0];
  const exposure = (params.exposureStops ?? 0) * LOG_EXPOSURE_PER_STOP;
  // Channels are aligned on green's range in log exposure: neutral shadows and highlights.
  const g = params.stock.gamma;
  const refLo = params.levels.shadow[1] / g[1];
  const refHi = params.levels.highlight[1] / g[1];
  const black = WHITE * 10 ** (refLo - refHi);
  for (let c = 0; c < 3; c++) {
    const lo = params.levels.shadow[c]! / g[c]!;
    const hi = params.levels.highlight[c]! / g[c]!;
    const span = hi - lo || 1;
    const balance = (points[c]! + params.stock.balancePoints[c]!) * LOG_EXPOSURE_PER_POINT;
    for (let i = 0; i < OUT_SIZE; i++) {
      const density = DENSITY_MIN + (i * (DENSITY_MAX - DENSITY_MIN)) / (OUT_SIZE - 1);
      const logH = refLo + ((density / g[c]! - lo) / span) * (refHi - refLo);
      const y = WHITE * 10 ** (logH - refHi + balance + exposure);
      let v: number;
      if (params.render === 'reference') {
        v = srgbEncode(y);
      } else {
        // Print-like: black point to zero, then a gentle S in the encoded value.
        const s = srgbEncode(Math.max(0, (y - black) / (WHITE - black)) * WHITE);
        v = s + 0.2 * (s * s * (3 - 2 * s) - s);
      }
      outputLut[c * OUT_SIZE + i] = Math.round(Math.min(1, Math.max(0, v)) * full);
    }
  }
  const densityScale = (OUT_SIZE - 1) / (DENSITY_MAX - DENSITY_MIN);
  let directLut: Uint16Array | null = null;
  if (!crosstalk) {
    directLut = new Uint16Array(3 * 65536);
    for (let c = 0; c < 3; c++) {
      for (let code = 0; code < 65536; code++) {
        directLut[c * 65536 + code] =
          outputLut[
            c * OUT_SIZE + quantiseDensity(densityLut[c * 65536 + code]!, DENSITY_MIN, densityScale)
          ]!;
      }
    }
  }
  return {
    output: params.output,
    densityLut,
    crosstalk,
    outputLut,
    directLut,
    densityMin: DENSITY_MIN,
    densityScale,
  };
}

function quantiseDensity(x: number, densityMin: number, densityScale: number): number {
  const q = ((x - densityMin) * densityScale + 0.5) | 0;
  return q < 0 ? 0 : q > OUT_SIZE - 1 ? OUT_SIZE - 1 : q;
}

/** Inverts pixels [firstPixel, firstPixel + pixelCount) of interleaved RGB `input` into `output`. */
export function applyInversion(
  plan: InversionPlan,
  input: Uint16Array,
  output: Uint8Array | Uint16Array,
  firstPixel: number,
  pixelCount: number,
): void {
  const { densityLut: d, outputLut: o, densityMin, densityScale, crosstalk: m, directLut } = plan;
  const end = (firstPixel + pixelCount) * 3;
  if (directLut) {
    for (let i = firstPixel * 3; i < end; i += 3) {
      output[i] = directLut[input[i]!]!;
      output[i + 1] = directLut[65536 + input[i + 1]!]!;
      output[i + 2] = directLut[131072 + input[i + 2]!]!;
    }
    return;
  }
  const top = OUT_SIZE - 1;
  const quantise = (x: number) => {
    const q = ((x - densityMin) * densityScale + 0.5) | 0;
    return q < 0 ? 0 : q > top ? top : q;
  };
  for (let i = firstPixel * 3; i < end; i += 3) {
    let r = d[input[i]!]!;
    let gr = d[65536 + input[i + 1]!]!;
    let b = d[131072 + input[i + 2]!]!;
    if (m) {
      const r2 = m[0]! * r + m[1]! * gr + m[2]! * b;
      const g2 = m[3]! * r + m[4]! * gr + m[5]! * b;
      b = m[6]! * r + m[7]! * gr + m[8]! * b;
      r = r2;
      gr = g2;
    }
    output[i] = o[quantise(r)]!;
    output[i + 1] = o[OUT_SIZE + quantise(gr)]!;
    output[i + 2] = o[2 * OUT_SIZE + quantise(b)]!;
  }
}
