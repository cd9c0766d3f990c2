// Two invented film models for the calibration tests, built apart from forward-model.ts and unlike it in every
// part: spectral layer sensitivities under a black-body taking light, characteristic curves of another shape
// (hyperbolic toe and shoulder), spectral dye absorptions with their unwanted lobes, a spectral base, and a scanner
// of its own bands, so the colours mix in exposure (overlapping sensitivities) and in density (the dyes seen through
// the scanner's bands) by physics, not by a matrix. For tests only: index.ts does not export it.
import type { Region } from '../film-base';
import type { SyntheticNegative } from '../forward-model';
import { FULL_SCALE_16 } from '../scanner-input';
import type { Rgb } from '../srgb';
import { MID_GREY } from '../tone-curve';
import { CHART_REFERENCE } from './chart-reference';
import type { CalibrationRoll } from './calibration-roll';
import { lobe, reflectanceFromLabD50, spectrum, TAKING_LIGHT, type Spectrum } from './test-spectra';

/** A Gaussian band: peak (nm), widths below and above it (nm), height. */
export interface Band {
  peak: number;
  below: number;
  above: number;
  height: number;
}

/** An invented film, spectral throughout. Channel order red, green, blue; dyes cyan, magenta, yellow. */
export interface SpectralFilmModel {
  name: string;
  iso: number;
  base: 'clear' | 'tinted' | 'masked';
  /** Spectral sensitivity of the red-, green- and blue-sensitive layers, each a sum of bands. */
  sensitivity: [Band[], Band[], Band[]];
  /** Straight-line slope of each layer's dye amount per log exposure (dye amount in units of its peak density). */
  gamma: Rgb;
  /** Relative log exposure (0 = the metered 18 % grey) where each layer's toe hyperbola has its corner. */
  toe: Rgb;
  /** Width of the toe's bend, log exposure. */
  toeWidth: number;
  /** Dye amount the shoulder approaches, per layer. */
  maxDye: Rgb;
  /** Width of the shoulder's bend, dye amount. */
  shoulderWidth: number;
  /** Dye formed with no exposure (fog), per layer. */
  fog: Rgb;
  /** Spectral density of the cyan, magenta and yellow dyes at unit amount, each a sum of bands (unwanted lobes too). */
  dyes: [Band[], Band[], Band[]];
  /** Spectral density of the film base. */
  baseDensity: Band[];
  /** Spectral response of the scanner's red, green and blue channels (light source × filter × sensor). */
  scannerBands: [Band, Band, Band];
}

// Invented values, in ranges typical of colour negative film and its scanners, from memory.
/** Invented: clear base, narrow red layer, steep curves, a scanner of narrow LED bands. */
export const SPECTRAL_FILM_NORTH: SpectralFilmModel = {
  name: 'Test film North 160',
  iso: 160,
  base: 'clear',
  sensitivity: [
    [{ peak: 648, below: 22, above: 16, height: 1 }],
    [
      { peak: 548, below: 26, above: 30, height: 1 },
      { peak: 600, below: 20, above: 20, height: 0.12 },
    ],
    [{ peak: 446, below: 22, above: 26, height: 1 }],
  ],
  gamma: [0.66, 0.71, 0.76],
  toe: [-1.9, -1.95, -1.85],
  toeWidth: 0.35,
  maxDye: [2.9, 3.1, 3.3],
  shoulderWidth: 0.3,
  fog: [0.06, 0.07, 0.09],
  dyes: [
    [
      { peak: 668, below: 45, above: 60, height: 1 },
      { peak: 540, below: 40, above: 40, height: 0.13 },
      { peak: 440, below: 30, above: 30, height: 0.07 },
    ],
    [
      { peak: 548, below: 32, above: 36, height: 1 },
      { peak: 440, below: 30, above: 30, height: 0.24 },
      { peak: 660, below: 30, above: 40, height: 0.05 },
    ],
    [
      { peak: 446, below: 40, above: 28, height: 1 },
      { peak: 545, below: 30, above: 30, height: 0.08 },
    ],
  ],
  baseDensity: [{ peak: 400, below: 1, above: 120, height: 0.05 }],
  scannerBands: [
    { peak: 660, below: 10, above: 10, height: 1 },
    { peak: 545, below: 12, above: 12, height: 1 },
    { peak: 455, below: 10, above: 10, height: 1 },
  ],
};

/** Invented: blue-grey tinted base, broad overlapping layers, soft low-contrast curves, a scanner of broad filters. */
export const SPECTRAL_FILM_SOUTH: SpectralFilmModel = {
  name: 'Test film South 640',
  iso: 640,
  base: 'tinted',
  sensitivity: [
    [{ peak: 622, below: 30, above: 26, height: 1 }],
    [{ peak: 540, below: 34, above: 34, height: 1 }],
    [
      { peak: 462, below: 28, above: 30, height: 1 },
      { peak: 510, below: 15, above: 15, height: 0.1 },
    ],
  ],
  gamma: [0.5, 0.53, 0.57],
  toe: [-2.35, -2.3, -2.25],
  toeWidth: 0.5,
  maxDye: [2.3, 2.4, 2.55],
  shoulderWidth: 0.45,
  fog: [0.15, 0.14, 0.17],
  dyes: [
    [
      { peak: 655, below: 55, above: 55, height: 1 },
      { peak: 530, below: 45, above: 45, height: 0.18 },
      { peak: 430, below: 35, above: 35, height: 0.1 },
    ],
    [
      { peak: 540, below: 38, above: 40, height: 1 },
      { peak: 430, below: 35, above: 35, height: 0.3 },
      { peak: 650, below: 35, above: 35, height: 0.08 },
    ],
    [
      { peak: 440, below: 45, above: 30, height: 1 },
      { peak: 530, below: 35, above: 35, height: 0.12 },
    ],
  ],
  baseDensity: [
    { peak: 400, below: 1, above: 1e6, height: 0.07 },
    { peak: 650, below: 60, above: 80, height: 0.12 },
  ],
  scannerBands: [
    { peak: 640, below: 25, above: 30, height: 1 },
    { peak: 550, below: 25, above: 25, height: 1 },
    { peak: 450, below: 22, above: 25, height: 1 },
  ],
};

const bands = (b: Band[]): Spectrum =>
  spectrum((nm) => b.reduce((s, x) => s + x.height * lobe(nm, x.peak, x.below, x.above), 0));

const SPECTRA = new WeakMap<SpectralFilmModel, ReturnType<typeof sampleSpectra>>();

/** The model's spectra, sampled once per model. */
function spectraOf(model: SpectralFilmModel) {
  let s = SPECTRA.get(model);
  if (!s) SPECTRA.set(model, (s = sampleSpectra(model)));
  return s;
}

function sampleSpectra(model: SpectralFilmModel) {
  const layers = model.sensitivity.map((s) => {
    const w = bands(s).map((v, i) => v * TAKING_LIGHT[i]!);
    const total = w.reduce((a, b) => a + b, 0);
    return w.map((v) => v / total);
  });
  return {
    layers,
    dyes: model.dyes.map(bands),
    base: bands(model.baseDensity),
    scanner: model.scannerBands.map((b) => {
      const s = bands([b]);
      const total = s.reduce((a, v) => a + v, 0);
      return s.map((v) => v / total);
    }),
  };
}

/** Exposure of each layer (1 = a perfect white at the metered exposure) from a reflectance spectrum. */
export function layerExposures(model: SpectralFilmModel, reflectance: Spectrum): Rgb {
  return spectraOf(model).layers.map((w) => w.reduce((s, v, i) => s + v * reflectance[i]!, 0)) as Rgb;
}

/** Dye amount a layer forms at a relative log exposure: hyperbolic toe, then a straight line, hyperbolic shoulder. */
export function dyeAmount(model: SpectralFilmModel, layer: 0 | 1 | 2, logExposure: number): number {
  const g = model.gamma[layer],
    top = model.maxDye[layer],
    w = model.toeWidth,
    v = model.shoulderWidth;
  const u = logExposure - model.toe[layer];
  const t = 0.5 * g * (u + Math.sqrt(u * u + w * w));
  const softMin = (x: number) => x - 0.5 * (x - top + Math.sqrt((x - top) ** 2 + v * v));
  return softMin(t) - softMin(0) + model.fog[layer];
}

/** What each scanner channel reads (transmittance, 0..1 of the bare light) through base and dye amounts. */
export function scannerTransmittance(model: SpectralFilmModel, dye: Rgb): Rgb {
  const s = spectraOf(model);
  const t = s.base.map(
    (b, i) => 10 ** -(b + dye[0] * s.dyes[0]![i]! + dye[1] * s.dyes[1]![i]! + dye[2] * s.dyes[2]![i]!),
  );
  return s.scanner.map((band) => band.reduce((a, v, i) => a + v * t[i]!, 0)) as Rgb;
}

/** Density above base and fog each scanner channel reads on a neutral at a relative log exposure. */
export function neutralDensity(model: SpectralFilmModel, logExposure: number): Rgb {
  const dye = [0, 1, 2].map((c) => dyeAmount(model, c as 0 | 1 | 2, logExposure)) as Rgb;
  const t = scannerTransmittance(model, dye);
  const floor = scannerTransmittance(model, model.fog);
  return [0, 1, 2].map((c) => Math.log10(floor[c]! / t[c]!)) as Rgb;
}

/**
 * Analytic density of one channel at a relative log exposure: its own dye alone (the others at fog) read through its
 * own scanner channel, above base and fog — what the profile's curves after crosstalk describe.
 */
export function analyticDensity(model: SpectralFilmModel, channel: 0 | 1 | 2, logExposure: number): number {
  const dye = [...model.fog] as Rgb;
  dye[channel] = dyeAmount(model, channel, logExposure);
  return Math.log10(
    scannerTransmittance(model, model.fog)[channel]! / scannerTransmittance(model, dye)[channel]!,
  );
}

/** Relative log exposure where each channel's neutral density is `density` above base and fog (bisection). */
export function modelLogExposureAt(model: SpectralFilmModel, density: number): Rgb {
  return [0, 1, 2].map((c) => {
    let lo = -6,
      hi = 4;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (neutralDensity(model, mid)[c]! < density) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  }) as Rgb;
}

/** Options of `exposeSpectral`. */
export interface SpectralExposure {
  /** Stops from the metered exposure. */
  stops: number;
  /** Grain: standard deviation of each dye's amount per pixel. */
  grain: number;
  seed: number;
  /** Rebate above and below the frame, pixels. */
  rebate: number;
}

/**
 * Exposes, develops and scans a frame of `columns` × rows square patches of `patchSize` pixels, each a reflectance
 * spectrum, into 16-bit linear counts (a linear scanner: no black level, unit gains).
 */
export function exposeSpectral(
  model: SpectralFilmModel,
  patches: readonly Spectrum[],
  columns: number,
  patchSize: number,
  options: SpectralExposure,
): SyntheticNegative {
  const rows = Math.ceil(patches.length / columns);
  const width = columns * patchSize,
    height = rows * patchSize + 2 * options.rebate;
  const data = new Uint16Array(width * height * 3);
  const shift = options.stops * Math.log10(2);
  const dyes = patches.map((r) =>
    layerExposures(model, r).map((h, c) =>
      dyeAmount(model, c as 0 | 1 | 2, Math.log10(Math.max(h, 1e-6) / MID_GREY) + shift),
    ),
  ) as Rgb[];
  let state = (options.seed * 2654435761) >>> 0 || 1;
  // xorshift32 (G. Marsaglia, "Xorshift RNGs", J. Stat. Softw. 8(14), 2003), then Box–Muller.
  const uniform = () => {
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return (state + 0.5) / 4294967296;
  };
  const gauss = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const py = y - options.rebate;
      const k =
        py >= 0 && py < rows * patchSize
          ? Math.floor(py / patchSize) * columns + Math.floor(x / patchSize)
          : -1;
      const dye: Rgb = k >= 0 && k < dyes.length ? [...dyes[k]!] : [...model.fog];
      const noisy = dye.map((d) => d + options.grain * gauss()) as Rgb;
      const t = scannerTransmittance(model, noisy);
      for (let c = 0; c < 3; c++)
        data[(y * width + x) * 3 + c] = Math.round(FULL_SCALE_16 * Math.min(1, t[c]!));
    }
  }
  return {
    width,
    height,
    data,
    truth: {
      base: scannerTransmittance(model, model.fog),
      baseRegion: [0, 0, width, options.rebate],
      frame: [0, options.rebate, width, rows * patchSize],
      midLogExposure: Math.log10(0.18) + shift,
    },
  };
}

/** Options of `spectralCalibrationRoll`. */
export interface SpectralRollOptions {
  /** Grey card exposures, stops. Default −6 … +8 in half stops, as `calibrationRoll`. */
  stops?: readonly number[];
  /** Exposure of the chart frame, stops. Default 0. */
  chartStops?: number;
  /** Grain, dye amount. Default 0.01. */
  grain?: number;
}

const PATCH = 20,
  GREY = 24,
  REBATE = 6;

/**
 * A calibration roll of a spectral model: an 18 % grey card (flat reflectance) bracketed over `stops`, and one frame
 * of the 24-patch chart, each patch a smooth spectrum with the chart's published L*a*b* D50 under the taking light.
 * Same layout and marks as `calibrationRoll`.
 * @example spectralCalibrationRoll(SPECTRAL_FILM_NORTH).brackets.length // 29
 */
export function spectralCalibrationRoll(
  model: SpectralFilmModel,
  options: SpectralRollOptions = {},
): CalibrationRoll {
  const stops = options.stops ?? Array.from({ length: 29 }, (_, i) => -6 + i / 2);
  const grain = options.grain ?? 0.01;
  const grey = spectrum(() => MID_GREY);
  const brackets = stops.map((s, i) => ({
    stops: s,
    negative: exposeSpectral(model, [grey], 1, GREY, { stops: s, grain, seed: 300 + i, rebate: REBATE }),
  }));
  const chart = exposeSpectral(model, CHART_PATCH_SPECTRA, 6, PATCH, {
    stops: options.chartStops ?? 0,
    grain,
    seed: 17,
    rebate: REBATE,
  });
  const q = GREY / 4;
  const chartRegion: Region = [0, REBATE, 6 * PATCH, 4 * PATCH];
  return {
    brackets,
    chart,
    chartRegion,
    chartCorners: [
      [0, REBATE],
      [6 * PATCH, REBATE],
      [6 * PATCH, REBATE + 4 * PATCH],
      [0, REBATE + 4 * PATCH],
    ],
    greyRegion: [q, REBATE + q, GREY / 2, GREY / 2],
    baseRegion: [0, 0, GREY, REBATE],
  };
}

/** The chart's patches as reflectance spectra (published L*a*b* D50, McCamy et al. 1976; maker's 2016 values). */
export const CHART_PATCH_SPECTRA: readonly Spectrum[] = CHART_REFERENCE.map((p) =>
  reflectanceFromLabD50(p.labD50),
);
