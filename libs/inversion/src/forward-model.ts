import type { ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import type { Region, RgbImage } from './film-base';
import { adaptD50ToD65, D50_WHITE, D65_WHITE, labToXyz, xyzToLab } from './lab';
import { stopsToLogExposure } from './printer-points';
import { encodeScannerValue, FULL_SCALE_16 } from './scanner-input';
import { CAPTURE_PRIMARIES_TO_XYZ, LINEAR_SRGB_TO_WIDE } from './capture-primaries';
import { invert3, multiply3, xyzToLinearSrgb, type Matrix3, type Rgb } from './srgb';

/** An invented film stock for the forward model: per-channel curve shape, fog, base and dye crosstalk. */
export interface FilmStock {
  name: string;
  base: 'clear' | 'tinted' | 'masked';
  iso: number;
  /** Straight-line slope per channel, density per log exposure. */
  gamma: Rgb;
  /** Log exposure (scene-relative: 18 % grey at normal exposure is log10 0.18) where the toe bends, per channel. */
  toe: Rgb;
  /** Density the shoulder approaches, per channel. */
  maxDensity: Rgb;
  /** Width of toe and shoulder bends, log exposure. */
  softness: number;
  /** Fog density per channel. */
  fog: Rgb;
  /** Base density per channel (tint or mask, modelled as uniform). */
  baseDensity: Rgb;
  /** The correction M the matching profile holds; the film's densities are M⁻¹ · dye densities. */
  crosstalk: Matrix3;
  /**
   * The film's three exposures from a linear sRGB scene, H = S · rgb (row-major). Absent: the sRGB primaries
   * themselves (S = identity), which cannot record a colour outside sRGB (a negative component is no light).
   */
  sensitivity?: Matrix3;
}

/**
 * A wide-gamut film sensitivity: linear sRGB → linear ITU-R BT.2020 RGB (`LINEAR_SRGB_TO_WIDE`, ITU-R BT.2087-0
 * (2015); same D65 white, so neutrals stay neutral). Every chart colour exposes it positively. Scene-linear values
 * recovered from such a film are in these primaries: `WIDE_GAMUT_TO_XYZ` takes them to XYZ, and its profile says
 * `capturePrimaries: 'wide'` so the inversion renders them in sRGB primaries.
 */
export const WIDE_GAMUT_SENSITIVITY: Matrix3 = LINEAR_SRGB_TO_WIDE;

/** Linear RGB in the wide-gamut film's primaries → CIE XYZ (D65): the sRGB matrix after the sensitivity's inverse. */
export const WIDE_GAMUT_TO_XYZ: Matrix3 = CAPTURE_PRIMARIES_TO_XYZ.wide;

// Invented stocks for tests and the demo. Gammas around 0.6 (common practice of the trade); toe, shoulder,
// fog and base densities are invented values in ranges typical of colour negative film, from memory.
/** Invented: unmasked, clear polyester base, ISO 200. */
export const POLYCLEAR_200: FilmStock = {
  name: 'Clearbase Polyclear 200',
  base: 'clear',
  iso: 200,
  gamma: [0.6, 0.63, 0.68],
  toe: [-2.3, -2.25, -2.2],
  maxDensity: [2.6, 2.7, 2.8],
  softness: 0.25,
  fog: [0.08, 0.09, 0.1],
  baseDensity: [0.05, 0.05, 0.06],
  crosstalk: [
    [1.08, -0.06, -0.02],
    [-0.05, 1.1, -0.05],
    [-0.01, -0.12, 1.13],
  ],
};
/** Invented: unmasked, blue-grey tinted polyester base, ISO 400. */
export const TINTLINE_400: FilmStock = {
  name: 'Clearbase Tintline 400',
  base: 'tinted',
  iso: 400,
  gamma: [0.58, 0.6, 0.64],
  toe: [-2.45, -2.4, -2.35],
  maxDensity: [2.5, 2.6, 2.6],
  softness: 0.3,
  fog: [0.12, 0.12, 0.14],
  baseDensity: [0.18, 0.12, 0.08],
  crosstalk: [
    [1.1, -0.08, -0.02],
    [-0.06, 1.12, -0.06],
    [-0.02, -0.14, 1.16],
  ],
};
/** Invented: masked (uniform mask density) on acetate-like base, ISO 100, for comparison. */
export const AMBERMASK_100: FilmStock = {
  name: 'Clearbase Ambermask 100',
  base: 'masked',
  iso: 100,
  gamma: [0.62, 0.62, 0.64],
  toe: [-2.2, -2.2, -2.15],
  maxDensity: [2.7, 2.8, 2.9],
  softness: 0.25,
  fog: [0.07, 0.08, 0.09],
  baseDensity: [0.25, 0.55, 0.85],
  crosstalk: [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ],
};
/** The invented stocks. */
export const DEMO_STOCKS: readonly FilmStock[] = [POLYCLEAR_200, TINTLINE_400, AMBERMASK_100];

/**
 * Dye density above fog of one channel at a log exposure: straight line of slope γ, soft toe and shoulder.
 * @example filmDensity(POLYCLEAR_200, 1, Math.log10(0.18)) // ≈ 0.97
 */
export function filmDensity(stock: FilmStock, channel: 0 | 1 | 2, logExposure: number): number {
  const s = stock.softness;
  const g = stock.gamma[channel];
  const toe = g * s * Math.log10(1 + 10 ** ((logExposure - stock.toe[channel]) / s));
  const dmax = stock.maxDensity[channel];
  return -s * Math.log10(10 ** (-toe / s) + 10 ** (-dmax / s)) + s * Math.log10(1 + 10 ** (-dmax / s));
}

/**
 * A stock profile matching an invented stock: curves sampled every 0.1 log exposure from −2.3 (where
 * the toe slope is near the 0.2 floor, below which the profile extrapolates with that slope) to 1.7.
 * @example profileForStock(POLYCLEAR_200).curves.green.points.length // 41
 */
export function profileForStock(stock: FilmStock): ProfileDocument {
  const curve = (c: 0 | 1 | 2) => ({
    points: Array.from({ length: 41 }, (_, i) => {
      const x = Math.round((-2.3 + 0.1 * i) * 1e6) / 1e6;
      return { logExposure: x, density: filmDensity(stock, c, x) };
    }),
  });
  return {
    schemaVersion: 1,
    id: stock.name.toLowerCase().replace(/[^a-z0-9]+/g, '-'),
    version: 1,
    stock: { name: stock.name, process: 'C-41', base: stock.base, iso: stock.iso },
    curves: { red: curve(0), green: curve(1), blue: curve(2) },
    crosstalk: stock.crosstalk,
    balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
    tone: { contrast: 1.15, blackPoint: 0.002, whitePoint: 1.1 },
    saturation: 1,
    // A film of the wide sensitivity says so; one of sRGB sensitivity (absent) keeps the older document's shape.
    ...(sameMatrix(stock.sensitivity, LINEAR_SRGB_TO_WIDE) ? { capturePrimaries: 'wide' as const } : {}),
  };
}

function sameMatrix(a: Matrix3 | undefined, b: Matrix3): boolean {
  return a !== undefined && a.every((row, r) => row.every((x, k) => x === b[r]![k]));
}

/** A scene in linear sRGB (D65), width × height × 3 floats. */
export interface Scene {
  width: number;
  height: number;
  rgb: Float32Array;
}

/** One patch of the 24-patch chart: published L*a*b* D50 (truth) and its scene rectangle. */
export interface ChartPatch {
  index: number;
  name: string;
  labD50: Rgb;
  rect: Region;
}

/**
 * Published L*a*b* (D50) → linear sRGB via Bradford adaptation to D65.
 * @example labD50ToLinearSrgb([96.54, -0.43, 1.19]) // ≈ [0.88, 0.89, 0.89]
 */
export function labD50ToLinearSrgb(lab: Rgb): Rgb {
  return xyzToLinearSrgb(adaptD50ToD65(labToXyz(lab, D50_WHITE)));
}

/**
 * The D65 L*a*b* a patch should reproduce: published D50 L*a*b*, Bradford-adapted to D65.
 * @example labD50ToLabD65([50, 0, 0]) // ≈ [50, 0, 0]
 */
export function labD50ToLabD65(lab: Rgb): Rgb {
  return xyzToLab(adaptD50ToD65(labToXyz(lab, D50_WHITE)), D65_WHITE);
}

/**
 * The 24-patch chart as a scene, 6 × 4 patches of `patchSize` pixels, from rows of published L*a*b* D50.
 * @example chartScene(patches, 32).scene.width // 192
 */
export function chartScene(
  patches: { name: string; labD50: Rgb }[],
  patchSize: number,
): { scene: Scene; patches: ChartPatch[] } {
  const width = 6 * patchSize,
    height = 4 * patchSize;
  const rgb = new Float32Array(width * height * 3);
  const out: ChartPatch[] = patches.map((p, index) => {
    const px = (index % 6) * patchSize,
      py = Math.floor(index / 6) * patchSize;
    const lin = labD50ToLinearSrgb(p.labD50);
    for (let y = py; y < py + patchSize; y++)
      for (let x = px; x < px + patchSize; x++) rgb.set(lin, (y * width + x) * 3);
    return { index: index + 1, name: p.name, labD50: p.labD50, rect: [px, py, patchSize, patchSize] };
  });
  return { scene: { width, height, rgb }, patches: out };
}

/**
 * Neutral steps from `darkest` to `lightest` reflectance, evenly spaced in log, side by side.
 * @example greySteps(11, 0.03, 0.9, 16).width // 176
 */
export function greySteps(
  steps: number,
  darkest: number,
  lightest: number,
  stepWidth: number,
  height = stepWidth,
): Scene {
  const width = steps * stepWidth;
  const rgb = new Float32Array(width * height * 3);
  for (let x = 0; x < width; x++) {
    const k = Math.floor(x / stepWidth);
    const v = darkest * (lightest / darkest) ** (steps > 1 ? k / (steps - 1) : 0);
    for (let y = 0; y < height; y++) rgb.fill(v, (y * width + x) * 3, (y * width + x) * 3 + 3);
  }
  return { width, height, rgb };
}

/**
 * A horizontal neutral gradient, log-even from `darkest` to `lightest`.
 * @example gradientScene(256, 16, 0.01, 1).rgb.length // 256 * 16 * 3
 */
export function gradientScene(width: number, height: number, darkest: number, lightest: number): Scene {
  const rgb = new Float32Array(width * height * 3);
  for (let x = 0; x < width; x++) {
    const v = darkest * (lightest / darkest) ** (x / Math.max(1, width - 1));
    for (let y = 0; y < height; y++) rgb.fill(v, (y * width + x) * 3, (y * width + x) * 3 + 3);
  }
  return { width, height, rgb };
}

/**
 * An invented outdoor scene in linear sRGB: sky gradient, grass, a skin-like patch and a shadow.
 * @example outdoorScene(300, 200).width // 300
 */
export function outdoorScene(width: number, height: number): Scene {
  const rgb = new Float32Array(width * height * 3);
  // Invented reflectances, typical of such surfaces (from memory).
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let c: Rgb;
      const horizon = 0.55 * height;
      if (y < horizon) {
        const t = y / horizon;
        c = [0.18 + 0.3 * t, 0.3 + 0.3 * t, 0.7 + 0.1 * t];
      } else c = [0.06, 0.14, 0.035];
      const cx = x - 0.65 * width,
        cy = y - 0.6 * height;
      if (cx * cx + cy * cy < (0.1 * height) ** 2) c = [0.45, 0.3, 0.23];
      if (x < 0.3 * width && y > 0.7 * height) c = [c[0] * 0.1, c[1] * 0.1, c[2] * 0.12];
      rgb.set(c, (y * width + x) * 3);
    }
  }
  return { width, height, rgb };
}

/** Options of `exposeNegative`. */
export interface ExposeOptions {
  stock: FilmStock;
  scanner: ScannerProfile;
  /** Exposure relative to the box speed, stops (+1 = one stop over). */
  exposureStops?: number;
  /** Grain: standard deviation of density noise per pixel, D. 0 = none. */
  grain?: number;
  seed?: number;
  /** Rebate height above and below the frame, pixels (unexposed film). */
  rebate?: number;
  /** Punch sprocket holes (bare light, clipped) into the rebate. */
  sprocketHoles?: boolean;
  /** Number of dust specks (dark discs) scattered over the whole scan. */
  dust?: number;
}

/** A synthetic negative scan and its truth. */
export interface SyntheticNegative extends RgbImage {
  truth: {
    /** Linear light of base + fog, what base detection should find. */
    base: Rgb;
    /** The top rebate strip, unexposed film. */
    baseRegion: Region;
    /** Where the scene sits in the scan. */
    frame: Region;
    /** Scene-relative log exposure of 18 % grey: log10 0.18 + exposure. */
    midLogExposure: number;
  };
}

/** Seeded PRNG (mulberry32, a public-domain 32-bit generator). */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Scene values below this are held to it before taking logs (16-bit black is far above, from memory). */
const MIN_SCENE = 1e-5;

/**
 * Exposes, develops and scans a scene: log exposure → per-channel curve → M⁻¹ (crosstalk) → + fog + base
 * → transmittance → scanner counts (16-bit), with grain, rebate, sprocket holes and dust.
 * @example exposeNegative(chartScene(rows, 32).scene, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER, rebate: 24, sprocketHoles: true })
 */
export function exposeNegative(scene: Scene, options: ExposeOptions): SyntheticNegative {
  const { stock, scanner } = options;
  const rebate = options.rebate ?? 0;
  const width = scene.width,
    height = scene.height + 2 * rebate;
  const data = new Uint16Array(width * height * 3);
  const random = prng(options.seed ?? 1);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const grain = options.grain ?? 0;
  const shift = stopsToLogExposure(options.exposureStops ?? 0);
  const mInv = invert3(stock.crosstalk);
  const write = (i: number, filmDensities: Rgb) => {
    for (let c = 0; c < 3; c++) {
      const d = filmDensities[c]! + stock.fog[c]! + stock.baseDensity[c]! + (grain ? grain * gauss() : 0);
      data[i + c] = Math.round(FULL_SCALE_16 * encodeScannerValue(10 ** -d, scanner, c as 0 | 1 | 2));
    }
  };
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3;
      const sy = y - rebate;
      if (sy < 0 || sy >= scene.height) {
        write(i, [0, 0, 0]);
        continue;
      }
      const j = (sy * width + x) * 3;
      const seen: Rgb = [scene.rgb[j]!, scene.rgb[j + 1]!, scene.rgb[j + 2]!];
      const h = stock.sensitivity ? multiply3(stock.sensitivity, seen) : seen;
      const dye: Rgb = [0, 1, 2].map((c) =>
        filmDensity(stock, c as 0 | 1 | 2, Math.log10(Math.max(h[c]!, MIN_SCENE)) + shift),
      ) as Rgb;
      write(i, multiply3(mInv, dye));
    }
  }
  if (options.sprocketHoles && rebate >= 6) {
    // Holes about half the rebate tall, spaced three rebates apart (invented proportions).
    const hw = Math.max(2, Math.round(rebate * 0.7)),
      hh = Math.max(2, Math.round(rebate * 0.5)),
      pitch = rebate * 3;
    for (const top of [Math.round(rebate * 0.25), height - rebate + Math.round(rebate * 0.25)]) {
      for (let x0 = Math.round(rebate * 0.5); x0 + hw <= width; x0 += pitch) {
        for (let y = top; y < top + hh; y++)
          for (let x = x0; x < x0 + hw; x++)
            data.fill(FULL_SCALE_16, (y * width + x) * 3, (y * width + x) * 3 + 3);
      }
    }
  }
  for (let k = 0; k < (options.dust ?? 0); k++) {
    const cx = random() * width,
      cy = random() * height,
      r = 1 + random() * 2.5;
    for (let y = Math.max(0, Math.floor(cy - r)); y < Math.min(height, Math.ceil(cy + r)); y++) {
      for (let x = Math.max(0, Math.floor(cx - r)); x < Math.min(width, Math.ceil(cx + r)); x++) {
        if ((x - cx) ** 2 + (y - cy) ** 2 <= r * r) {
          const i = (y * width + x) * 3;
          data[i] = data[i]! >> 3;
          data[i + 1] = data[i + 1]! >> 3;
          data[i + 2] = data[i + 2]! >> 3;
        }
      }
    }
  }
  const base = [0, 1, 2].map((c) => 10 ** -(stock.fog[c]! + stock.baseDensity[c]!)) as Rgb;
  return {
    width,
    height,
    data,
    truth: {
      base,
      baseRegion: [0, 0, width, rebate],
      frame: [0, rebate, scene.width, scene.height],
      midLogExposure: Math.log10(0.18) + shift,
    },
  };
}
