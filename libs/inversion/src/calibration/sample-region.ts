import type { ScannerProfile } from '@clearbase/contracts';
import { DEFAULT_CLIP_FRACTION, type Region, type RgbImage } from '../film-base';
import { FULL_SCALE_16, linearise } from '../scanner-input';
import type { Rgb } from '../srgb';
import type { Point } from './homography';

/** What a sampled area holds. */
export interface RegionSample {
  /** Trimmed mean linear transmitted light per channel, 0..1 of full scale (clipped pixels left out). */
  rgb: Rgb;
  /** Pixels whose centres fall in the area (and in the image). */
  pixels: number;
  /** Pixels averaged per channel after clipped ones and the trimmed tails are left out. */
  used: number;
  /** Fraction of the area's pixels at or above the clip level in some channel: bare light, not film. */
  clippedFraction: number;
  /** Fraction at or below the dark floor in some channel: film too dense for the scanner to read. */
  darkFraction: number;
  /** 'ok'; 'clipped' when more than `maxClippedFraction` is clipped or too dark; 'empty' when no pixel is usable. */
  status: 'ok' | 'clipped' | 'empty';
}

/** Options of `sampleRegion`. */
export interface SampleRegionOptions {
  /** Fraction dropped from each end of every channel's sorted values. Default 0.1 (dust, scratches, grain tails; from memory). */
  trim?: number;
  /** Counts at or above this in any channel are bare light. Default 0.985 of full scale, as base detection uses. */
  clipCount?: number;
  /** Counts at or below this in any channel are too dense to read. Default 16 (about 0.00025 of full scale, the noise floor of a 16-bit scan; from memory). */
  darkCount?: number;
  /** More than this fraction clipped or dark makes the sample 'clipped'. Default 0.01 (common practice, from memory). */
  maxClippedFraction?: number;
  /** Sample every n-th pixel in both directions. Default: 1, or the smallest step that keeps to `maxSamples`. */
  step?: number;
  /** With no `step`, the step is chosen so that at most about this many pixels are read. Default SAMPLE_MAX_PIXELS. */
  maxSamples?: number;
}

/** Pixels read at most by default: 2^18, plenty for a mean to 1e-4 at any grain (statistics, from memory), and bounded memory on a 100 MP frame. */
export const SAMPLE_MAX_PIXELS = 262_144;
/** Default trimmed-mean fraction per tail (from memory). */
export const SAMPLE_TRIM = 0.1;
/** Default dark floor in counts (from memory, the noise floor of a 16-bit scan). */
export const SAMPLE_DARK_COUNT = 16;
/** Default share of clipped pixels that marks a sample clipped (common practice, from memory). */
export const SAMPLE_MAX_CLIPPED = 0.01;

/**
 * Mean linear light per channel of a rectangle or a convex polygon (a chart patch's sampling area),
 * robust to dust and scratches: clipped pixels are counted and left out, then each channel's values are
 * sorted and `trim` of them dropped at each end before averaging (a trimmed mean). Pixels count as inside
 * when their centre is. Throws a RangeError for bad options.
 * @example sampleRegion(negative, LINEAR_SCANNER, [40, 40, 64, 64]).rgb // e.g. [0.21, 0.19, 0.17]
 */
export function sampleRegion(
  image: RgbImage,
  scanner: ScannerProfile,
  area: Region | readonly Point[],
  options: SampleRegionOptions = {},
): RegionSample {
  const trim = options.trim ?? SAMPLE_TRIM;
  if (!(typeof trim === 'number' && trim >= 0 && trim < 0.5))
    throw new RangeError(
      `Expected number from 0 to below 0.5 for trim but received ${trim} of type ${typeof trim}`,
    );
  if (options.step !== undefined && !(Number.isInteger(options.step) && options.step >= 1))
    throw new RangeError(
      `Expected integer of at least 1 for step but received ${options.step} of type ${typeof options.step}`,
    );
  const clip = options.clipCount ?? DEFAULT_CLIP_FRACTION * FULL_SCALE_16;
  const dark = options.darkCount ?? SAMPLE_DARK_COUNT;
  const maxClipped = options.maxClippedFraction ?? SAMPLE_MAX_CLIPPED;

  const polygon: readonly Point[] = isRegion(area)
    ? [
        [area[0], area[1]],
        [area[0] + area[2], area[1]],
        [area[0] + area[2], area[1] + area[3]],
        [area[0], area[1] + area[3]],
      ]
    : area;
  if (polygon.length < 3 || !polygon.every((p) => Number.isFinite(p[0]) && Number.isFinite(p[1])))
    throw new RangeError(
      `Expected a rectangle or at least 3 finite points for area but received ${JSON.stringify(area)}`,
    );
  const xs = polygon.map((p) => p[0]);
  const ys = polygon.map((p) => p[1]);
  const x0 = Math.max(0, Math.floor(Math.min(...xs)));
  const x1 = Math.min(image.width, Math.ceil(Math.max(...xs)));
  const y0 = Math.max(0, Math.floor(Math.min(...ys)));
  const y1 = Math.min(image.height, Math.ceil(Math.max(...ys)));
  const maxSamples = options.maxSamples ?? SAMPLE_MAX_PIXELS;
  const step =
    options.step ?? Math.max(1, Math.ceil(Math.sqrt(((x1 - x0) * (y1 - y0)) / Math.max(1, maxSamples))));
  const inside = isRegion(area) ? () => true : convexContains(polygon);

  const values: [number[], number[], number[]] = [[], [], []];
  let pixels = 0,
    clipped = 0,
    tooDark = 0;
  for (let y = y0; y < y1; y += step) {
    for (let x = x0; x < x1; x += step) {
      if (!inside(x + 0.5, y + 0.5)) continue;
      pixels++;
      const i = (y * image.width + x) * 3;
      const r = image.data[i]!,
        g = image.data[i + 1]!,
        b = image.data[i + 2]!;
      if (r >= clip || g >= clip || b >= clip) {
        clipped++;
        continue;
      }
      if (r <= dark || g <= dark || b <= dark) {
        tooDark++;
        continue;
      }
      values[0].push(linearise(r / FULL_SCALE_16, scanner, 0));
      values[1].push(linearise(g / FULL_SCALE_16, scanner, 1));
      values[2].push(linearise(b / FULL_SCALE_16, scanner, 2));
    }
  }
  const n = values[0].length;
  const clippedFraction = pixels ? clipped / pixels : 0;
  const darkFraction = pixels ? tooDark / pixels : 0;
  if (n === 0) return { rgb: [0, 0, 0], pixels, used: 0, clippedFraction, darkFraction, status: 'empty' };
  const cut = Math.floor(trim * n);
  const mean = (a: number[]) => {
    a.sort((p, q) => p - q);
    let s = 0;
    for (let k = cut; k < n - cut; k++) s += a[k]!;
    return s / (n - 2 * cut);
  };
  return {
    rgb: [mean(values[0]), mean(values[1]), mean(values[2])],
    pixels,
    used: n - 2 * cut,
    clippedFraction,
    darkFraction,
    status: clippedFraction + darkFraction > maxClipped ? 'clipped' : 'ok',
  };
}

function isRegion(area: Region | readonly Point[]): area is Region {
  return area.length === 4 && typeof area[0] === 'number';
}

/** Point-in-convex-polygon test, either winding. */
function convexContains(polygon: readonly Point[]): (x: number, y: number) => boolean {
  return (x, y) => {
    let sign = 0;
    for (let k = 0; k < polygon.length; k++) {
      const [ax, ay] = polygon[k]!;
      const [bx, by] = polygon[(k + 1) % polygon.length]!;
      const cross = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
      if (cross === 0) continue;
      const s = Math.sign(cross);
      if (sign === 0) sign = s;
      else if (s !== sign) return false;
    }
    return true;
  };
}
