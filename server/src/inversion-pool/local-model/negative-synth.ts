import type { Rgb } from './inversion-plan';

/** An invented demo stock for synthetic negatives. */
export interface SynthStock {
  name: string;
  /** Base density per channel (0 = perfectly clear). */
  baseDensity: Rgb;
  gamma: Rgb;
}

// Invented demo stocks. Gammas within colour negative's usual 0.5–0.7 (design notes, common practice).
export const SYNTH_STOCKS: Record<string, SynthStock> = {
  'larkspur-200': { name: 'Larkspur 200', baseDensity: [0.04, 0.04, 0.035], gamma: [0.62, 0.6, 0.58] },
  'tidewater-400': { name: 'Tidewater 400', baseDensity: [0.14, 0.08, 0.03], gamma: [0.58, 0.6, 0.61] },
};

// Relative output of the scanner's light per channel; an invented lamp, not white.
const LAMP: Rgb = [0.93, 1.0, 0.86];
// Scene reflectance at which the film just starts to respond (speed point a little under 1 % grey); from memory.
const THRESHOLD_LOG_H = Math.log10(0.002);
// Width of the curve's toe in log exposure; from memory.
const TOE = 0.12;

export interface SynthOptions {
  width: number;
  height: number;
  stock: SynthStock;
  /** Exposure offset in stops (frames of a roll vary a little). */
  exposureStops?: number;
  seed?: number;
}

export interface SynthNegative {
  width: number;
  height: number;
  data: Uint16Array;
  /** True base as linear transmitted light 0–1 of full scale, and where the rebate is. */
  base: Rgb;
  rebate: [x: number, y: number, width: number, height: number];
}

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Forward film model for demo and test negatives: scene reflectance → log exposure → toe-and-line
 * characteristic curve → base density → transmittance × lamp → 16-bit counts with grain, framed by
 * an unexposed rebate (top and bottom) with sprocket holes of bare light.
 */
export function synthesizeNegative(options: SynthOptions): SynthNegative {
  const { width, height, stock } = options;
  const rand = mulberry32(options.seed ?? 1);
  const rebateH = Math.max(4, Math.round(height * 0.1));
  const data = new Uint16Array(width * height * 3);
  const exposure = (options.exposureStops ?? 0) * Math.log10(2);
  const base = [0, 1, 2].map((c) => LAMP[c]! * 10 ** -stock.baseDensity[c]!) as Rgb;
  // Patch colours of the scene (reflectances), drawn once per negative.
  const cols = 6,
    rows = 3;
  const patches = Array.from({ length: cols * rows }, () => [
    0.03 + 0.8 * rand(),
    0.03 + 0.8 * rand(),
    0.03 + 0.8 * rand(),
  ]);
  // Density for each channel and reflectance level, tabulated so large frames are quick to make.
  const levels = 4096;
  const table = new Float32Array(3 * levels);
  for (let c = 0; c < 3; c++) {
    for (let k = 0; k < levels; k++) {
      const reflectance = 0.0005 + (k / (levels - 1)) * 0.9995;
      const x = (Math.log10(reflectance) + exposure - THRESHOLD_LOG_H) / TOE;
      const density = stock.gamma[c]! * TOE * (x > 30 ? x : Math.log1p(Math.exp(x)));
      table[c * levels + k] = base[c]! * 10 ** -density;
    }
  }
  const holeW = Math.max(2, Math.round(rebateH * 0.5));
  const holePitch = holeW * 3;
  const sceneTop = rebateH,
    sceneBottom = height - rebateH;
  for (let y = 0; y < height; y++) {
    const inRebate = y < sceneTop || y >= sceneBottom;
    const holeRow =
      inRebate &&
      (y < sceneTop
        ? y > rebateH * 0.3 && y < rebateH * 0.75
        : y > sceneBottom + rebateH * 0.25 && y < sceneBottom + rebateH * 0.7);
    const v = (y - sceneTop) / (sceneBottom - sceneTop);
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3;
      const u = x / width;
      if (holeRow && x % holePitch < holeW) {
        data[i] = data[i + 1] = data[i + 2] = 65535;
        continue;
      }
      for (let c = 0; c < 3; c++) {
        let light: number;
        if (inRebate) {
          light = base[c]!;
        } else {
          const reflectance =
            v < 0.6
              ? patches[
                  Math.min(rows - 1, Math.floor((v / 0.6) * rows)) * cols +
                    Math.min(cols - 1, Math.floor(u * cols))
                ]![c]!
              : 0.01 + 0.89 * u * u; // grey ramp, dark to light
          light = table[c * levels + Math.round(((reflectance - 0.0005) / 0.9995) * (levels - 1))]!;
        }
        // Grain and scanner noise: about 0.6 % of the signal plus a small floor; from memory.
        const noise = (rand() + rand() + rand() - 1.5) * (0.006 * light + 0.0004);
        data[i + c] = Math.min(65534, Math.max(0, Math.round((light + noise) * 65535)));
      }
    }
  }
  return { width, height, data, base, rebate: [0, 0, width, rebateH] };
}
