import type { Balance, Tone } from '@clearbase/contracts';
import quickselect from 'quickselect';
import type { Region, RgbImage } from './film-base';
import { DENSITY_RANGE, LUMINANCE_WEIGHTS, resolveInversion, type InversionParams } from './invert-pixel';
import { densityTable, exposureTable, EXPOSURE_TABLE_SIZE } from './inversion-tables';
import { MID_GREY } from './tone-curve';
import { LOG_EXPOSURE_PER_POINT, LOG_EXPOSURE_PER_STOP } from './printer-points';
import type { Rgb } from './srgb';

/** Exposure statistics of a frame, in log exposure (profile balance applied, no exposure offset). */
export interface FrameLevels {
  /** E_mid by auto exposure: luminance-weighted mean log exposure ("integrate to grey"). */
  midLogExposure: number;
  /** Per-channel mean log exposure. */
  channelMeans: Rgb;
  /** Luminance-weighted log exposure at the dark and light percentiles. */
  blackLogExposure: number;
  whiteLogExposure: number;
}

/** Options of `measureFrameLevels`. */
export interface MeasureLevelsOptions {
  /** Rectangle to measure (the frame, without rebate); whole image by default. */
  region?: Region;
  /** Measure every n-th pixel in both directions. Default: the smallest step keeping to MAX_LEVEL_SAMPLES pixels. */
  step?: number;
  /** Percentile for black and white points, 0..50. Default 0.5 (common practice of the trade, from memory). */
  clipPercent?: number;
}

/** Pixels measured at most by default: a strided sample, far more than a mean or a 0.5 % percentile needs (from memory). */
export const MAX_LEVEL_SAMPLES = 250_000;

/**
 * Measures a frame on a strided sample, through the same density and exposure tables as `compileInversion`: mean log exposure (for E_mid), per-channel means (for neutral balance) and black/white points.
 * @example measureFrameLevels({ ...params, midLogExposure: 0 }, negative, { region: negative.truth.frame }).midLogExposure // ≈ −0.75
 */
export function measureFrameLevels(
  params: Omit<InversionParams, 'midLogExposure' | 'exposureStops'>,
  image: RgbImage,
  options: MeasureLevelsOptions = {},
): FrameLevels {
  const full: InversionParams = { ...params, midLogExposure: 0, exposureStops: 0, render: 'reference' };
  const resolved = resolveInversion(full);
  const [x0, y0, w, h] = options.region ?? [0, 0, image.width, image.height];
  const step = Math.max(1, Math.floor(options.step ?? Math.ceil(Math.sqrt((w * h) / MAX_LEVEL_SAMPLES))));
  const dl = densityTable(params.scanner, params.base);
  const el = exposureTable(resolved, JSON.stringify(params.profile.curves));
  const [dMin, dMax] = DENSITY_RANGE;
  const last = EXPOSURE_TABLE_SIZE - 1;
  const scale = last / (dMax - dMin);
  const m = resolved.crosstalk;
  // Log exposure of density d in channel c's table, linearly interpolated (d' is held to the density range).
  const expo = (c: number, d: number): number => {
    const x = (d - dMin) * scale;
    if (!(x > 0)) return el[c * EXPOSURE_TABLE_SIZE]!;
    if (x >= last) return el[c * EXPOSURE_TABLE_SIZE + last]!;
    const k = x | 0;
    const lo = el[c * EXPOSURE_TABLE_SIZE + k]!;
    return lo + (x - k) * (el[c * EXPOSURE_TABLE_SIZE + k + 1]! - lo);
  };
  const sums: Rgb = [0, 0, 0];
  const lum = new Float64Array(Math.ceil(w / step) * Math.ceil(h / step));
  let count = 0;
  for (let y = y0; y < y0 + h; y += step) {
    for (let x = x0; x < x0 + w; x += step) {
      const i = (y * image.width + x) * 3;
      const d0 = dl[image.data[i]!]!,
        d1 = dl[65536 + image.data[i + 1]!]!,
        d2 = dl[131072 + image.data[i + 2]!]!;
      const er = expo(0, m[0][0] * d0 + m[0][1] * d1 + m[0][2] * d2),
        eg = expo(1, m[1][0] * d0 + m[1][1] * d1 + m[1][2] * d2),
        eb = expo(2, m[2][0] * d0 + m[2][1] * d1 + m[2][2] * d2);
      sums[0] += er;
      sums[1] += eg;
      sums[2] += eb;
      lum[count++] = LUMINANCE_WEIGHTS[0] * er + LUMINANCE_WEIGHTS[1] * eg + LUMINANCE_WEIGHTS[2] * eb;
    }
  }
  const n = Math.max(1, count);
  const channelMeans: Rgb = [sums[0] / n, sums[1] / n, sums[2] / n];
  const pct = (options.clipPercent ?? 0.5) / 100;
  const [black, white] = percentilePair(lum.subarray(0, count), pct);
  return {
    midLogExposure:
      LUMINANCE_WEIGHTS[0] * channelMeans[0] +
      LUMINANCE_WEIGHTS[1] * channelMeans[1] +
      LUMINANCE_WEIGHTS[2] * channelMeans[2],
    channelMeans,
    blackLogExposure: black,
    whiteLogExposure: white,
  };
}

/**
 * The values at ranks round(q·(n − 1)) and round((1 − q)·(n − 1)), q ≤ 0.5, the same as reading them from the
 * sorted values, by two selections in place (Floyd–Rivest, linear time) instead of a sort; [0, 0] when empty.
 */
export function percentilePair(values: Float64Array, q: number): [number, number] {
  const n = values.length;
  if (!n) return [0, 0];
  const rank = (p: number) => Math.min(n - 1, Math.max(0, Math.round(p * (n - 1))));
  const low = rank(q),
    high = rank(1 - q);
  // A typed array works as the plain array the package's types name: it only reads, writes and swaps by index.
  const arr = values as unknown as number[];
  quickselect(arr, low);
  const black = values[low]!;
  // Everything after `low` is at least values[low], so the high rank is selected there (read the low one first:
  // the second selection moves what it holds).
  if (high > low) quickselect(arr, high, low + 1);
  return [black, values[high]!];
}

/**
 * The pixels `measureFrameLevels` would measure by default (a strided grid over the region, at most
 * MAX_LEVEL_SAMPLES), copied into a small image of their own: measuring it with `{ step: 1 }` gives the same
 * levels as measuring the frame, so a roll can keep each frame's sample (about 1.5 MB) instead of the frame.
 * @example measureFrameLevels(params, levelSample(negative), { step: 1 }) // equals measureFrameLevels(params, negative)
 */
export function levelSample(
  image: RgbImage,
  options: Pick<MeasureLevelsOptions, 'region' | 'step'> = {},
): RgbImage {
  const sampler = levelSampler(image, options);
  sampler.take(image.data, image.height);
  return sampler.sample();
}

/** `levelSample` taken band by band, as a frame's rows arrive (see `levelSampler`). */
export interface LevelSampler {
  /** Takes the sample's pixels among rows [0, endRow) of `data` (a frame of the size given) not taken yet. */
  take(data: Uint16Array, endRow: number): void;
  /** The sample, once every row holding part of it has been taken; throws a RangeError before. */
  sample(): RgbImage;
}

/**
 * `levelSample` of a frame of the given size, taken while its rows arrive (for example as they are copied in,
 * while still in cache): the same pixels in the same order.
 * @example const s = levelSampler(frame); s.take(data, 200); s.take(data, frame.height); s.sample()
 */
export function levelSampler(
  frame: { width: number; height: number },
  options: Pick<MeasureLevelsOptions, 'region' | 'step'> = {},
): LevelSampler {
  const [x0, y0, w, h] = options.region ?? [0, 0, frame.width, frame.height];
  const step = Math.max(1, Math.floor(options.step ?? Math.ceil(Math.sqrt((w * h) / MAX_LEVEL_SAMPLES))));
  const width = Math.ceil(w / step),
    height = Math.ceil(h / step);
  const data = new Uint16Array(width * height * 3);
  let row = 0,
    o = 0;
  return {
    take(source, endRow) {
      for (; row < height && y0 + row * step < endRow; row++) {
        const y = y0 + row * step;
        for (let x = x0; x < x0 + w; x += step, o += 3) {
          const i = (y * frame.width + x) * 3;
          data[o] = source[i]!;
          data[o + 1] = source[i + 1]!;
          data[o + 2] = source[i + 2]!;
        }
      }
    },
    sample() {
      if (row < height)
        throw new RangeError(`Expected all ${height} rows of the sample but ${row} were taken`);
      return { width, height, data };
    },
  };
}

/**
 * Balance in printer points that brings every channel's mean to the neutral (grey-world in log exposure).
 * @example neutralBalance(levels) // { cyanRed: -3.1, magentaGreen: 0.4, yellowBlue: 2.2 }
 */
export function neutralBalance(levels: FrameLevels): Balance {
  const toPoints = (c: 0 | 1 | 2) =>
    (levels.midLogExposure - levels.channelMeans[c]) / LOG_EXPOSURE_PER_POINT;
  return { cyanRed: toPoints(0), magentaGreen: toPoints(1), yellowBlue: toPoints(2) };
}

/**
 * Tone black and white points (scene-linear, 18 % grey at E_mid) from measured levels, keeping a contrast.
 * @example levelsToTone(levels, 1.1) // { contrast: 1.1, blackPoint: 0.004, whitePoint: 1.3 }
 */
export function levelsToTone(
  levels: FrameLevels,
  contrast: number,
  midLogExposure = levels.midLogExposure,
): Tone {
  const blackPoint = Math.min(0.5, MID_GREY * 10 ** (contrast * (levels.blackLogExposure - midLogExposure)));
  const whitePoint = Math.min(
    16,
    Math.max(blackPoint * 1.01, MID_GREY * 10 ** (contrast * (levels.whiteLogExposure - midLogExposure))),
  );
  return { contrast, blackPoint, whitePoint };
}

/** Least log exposure kept between the black and the white point: one 1/6-stop step of the controls (our choice). */
export const MIN_POINT_GAP_LOG_EXPOSURE = LOG_EXPOSURE_PER_STOP / 6;

/**
 * Moves the black and white points of measured levels by whole stops of log exposure (one stop = log10 2): positive
 * moves a point to more exposure, so +1 on the black point prints one stop more of the shadows as black (deeper
 * blacks) and +1 on the white point needs one stop more to reach white (dimmer highlights). E_mid and the channel
 * means stay, so exposure and grey balance do not move. The white point is held at least
 * MIN_POINT_GAP_LOG_EXPOSURE above the black point.
 * @example shiftLevelPoints(levels, 1, 0).blackLogExposure - levels.blackLogExposure // 0.30103
 */
export function shiftLevelPoints(
  levels: FrameLevels,
  blackPointStops: number,
  whitePointStops: number,
): FrameLevels {
  if (!Number.isFinite(blackPointStops) || !Number.isFinite(whitePointStops))
    throw new RangeError(`Expected finite point shifts but received ${blackPointStops}, ${whitePointStops}`);
  const blackLogExposure = levels.blackLogExposure + blackPointStops * LOG_EXPOSURE_PER_STOP;
  const whiteLogExposure = Math.max(
    blackLogExposure + MIN_POINT_GAP_LOG_EXPOSURE,
    levels.whiteLogExposure + whitePointStops * LOG_EXPOSURE_PER_STOP,
  );
  return { ...levels, blackLogExposure, whiteLogExposure };
}

/** Roll-wide levels and each frame's deviation from them. */
export interface RollLevels {
  roll: FrameLevels;
  /** Per frame, frame − roll for every quantity. */
  deviations: FrameLevels[];
}

/**
 * Roll-wide levels from all frames: means of the frames' means (E_mid, channel means), medians of their
 * black and white points; deviations keep what each frame differs by.
 * @example rollLevels([a, b, c]).deviations[1].midLogExposure // how much lighter frame b is than the roll
 */
export function rollLevels(frames: FrameLevels[]): RollLevels {
  if (!frames.length) throw new RangeError('a roll needs at least one frame');
  const mean = (f: (l: FrameLevels) => number) => frames.reduce((s, l) => s + f(l), 0) / frames.length;
  const median = (f: (l: FrameLevels) => number) => {
    const s = frames.map(f).sort((a, b) => a - b);
    return s.length % 2 ? s[s.length >> 1]! : 0.5 * (s[s.length / 2 - 1]! + s[s.length / 2]!);
  };
  const roll: FrameLevels = {
    midLogExposure: mean((l) => l.midLogExposure),
    channelMeans: [
      mean((l) => l.channelMeans[0]),
      mean((l) => l.channelMeans[1]),
      mean((l) => l.channelMeans[2]),
    ],
    blackLogExposure: median((l) => l.blackLogExposure),
    whiteLogExposure: median((l) => l.whiteLogExposure),
  };
  const deviations = frames.map((l) => ({
    midLogExposure: l.midLogExposure - roll.midLogExposure,
    channelMeans: [0, 1, 2].map((c) => l.channelMeans[c]! - roll.channelMeans[c]!) as Rgb,
    blackLogExposure: l.blackLogExposure - roll.blackLogExposure,
    whiteLogExposure: l.whiteLogExposure - roll.whiteLogExposure,
  }));
  return { roll, deviations };
}
