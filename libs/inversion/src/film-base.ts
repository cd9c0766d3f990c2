import type { ScannerProfile } from '@clearbase/contracts';
import quickselect from 'quickselect';
import { linearise, FULL_SCALE_16 } from './scanner-input';
import type { Rgb } from './srgb';

/** A rectangle in pixels: x, y, width, height. */
export type Region = [x: number, y: number, width: number, height: number];

/** An interleaved 16-bit RGB image. */
export interface RgbImage {
  width: number;
  height: number;
  /** width × height × 3 counts, row-major, RGB interleaved. */
  data: Uint16Array;
}

/** A sampled film base. */
export interface FilmBase {
  /** Linear transmitted light of the base per channel, 0..1 of full scale. */
  rgb: Rgb;
  /** Region sampled (for detection: the row or column of base blocks holding most of them). */
  region: Region;
  /** 0 (no usable base) … 1 (large, even and clearly the least dense film). */
  confidence: number;
}

/** Options of base detection. */
export interface DetectFilmBaseOptions {
  /** Counts at or above this in any channel are bare light (sprocket holes, gaps), not film. Default 0.985 of full scale (from memory). */
  clipCount?: number;
  /** Side of the square blocks examined, pixels. Default 1/40 of the shorter side, at least 4. */
  blockSize?: number;
  /** Blocks within this fraction of the brightest even block count as base. Default 0.02 (from memory). */
  tolerance?: number;
}

/** Counts this close to full scale are bare light, not film (common practice of the trade, from memory). */
export const DEFAULT_CLIP_FRACTION = 0.985;
/** A block whose median absolute deviation exceeds this fraction of its median is texture, not even base (from memory). */
const EVENNESS = 0.04;
/** Pixels darker than this fraction of the block median are dust, left out (from memory). */
const DUST_FRACTION = 0.8;

/** Pixels examined at most for one detection or one drawn rectangle: a strided sample, plenty for a median (from memory). */
export const MAX_BASE_SAMPLES = 250_000;

function median(values: number[]): number {
  if (!values.length) return 0;
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[n >> 1]! : 0.5 * (s[n / 2 - 1]! + s[n / 2]!);
}

/** Grid step that keeps a w × h area within `MAX_BASE_SAMPLES` samples. */
function sampleStep(w: number, h: number): number {
  return Math.max(1, Math.ceil(Math.sqrt((w * h) / MAX_BASE_SAMPLES)));
}

/** Reusable sample buffers, grown on demand, so a detection allocates nothing per block. */
interface Scratch {
  sums: Uint32Array;
  /** Room to select medians in, which reorders what it holds. */
  work: Uint32Array;
  channel: Uint16Array;
  /** The unclipped samples' counts, gathered once: the frame is read once per block, not once per channel. */
  pixels: Uint16Array;
}

function scratchFor(scratch: Scratch | null, n: number): Scratch {
  if (scratch && scratch.sums.length >= n) return scratch;
  return {
    sums: new Uint32Array(n),
    work: new Uint32Array(n),
    channel: new Uint16Array(n),
    pixels: new Uint16Array(3 * n),
  };
}

/**
 * The middle value of unsorted values, or for an even count the two middle ones, as a sort would put them: by
 * selection in place (Floyd–Rivest, linear time), which reorders `values`. Blocks hold about a hundred samples, and
 * a detection takes a few thousand such medians, where a sort each costs several times more.
 */
function middlePair(values: Uint16Array | Uint32Array): [number, number] {
  const n = values.length;
  const upper = n >> 1;
  // A typed array works as the plain array the package's types name: it only reads, writes and swaps by index.
  quickselect(values as unknown as number[], upper);
  if (n % 2) return [values[upper]!, values[upper]!];
  // Everything before `upper` is at most values[upper]: the lower middle one is the largest of them.
  let lower = values[0]!;
  for (let i = 1; i < upper; i++) if (values[i]! > lower) lower = values[i]!;
  return [lower, values[upper]!];
}

/** Median of counts in linear light: the mean of the two middle ones' linear values for an even count. */
function linearMedian(counts: Uint16Array, scanner: ScannerProfile, c: 0 | 1 | 2): number {
  const [lo, hi] = middlePair(counts);
  const low = linearise(lo / FULL_SCALE_16, scanner, c);
  return lo === hi ? low : 0.5 * (low + linearise(hi / FULL_SCALE_16, scanner, c));
}

/**
 * Per-channel medians (linear light) of the unclipped pixels on a grid of `step` over a rectangle; dark specks
 * left out. The scanner's decoding is increasing, so medians are taken on counts and only they are linearised.
 * Null when too few pixels are film, or when the rectangle is less even than `maxSpread` (its medians are then
 * not taken: detection drops such blocks, and most of a frame's blocks are picture).
 */
function sampleRect(
  image: RgbImage,
  scanner: ScannerProfile,
  rect: Region,
  clip: number,
  step: number,
  buffers: { scratch: Scratch | null },
  maxSpread = Infinity,
): { rgb: Rgb; used: number; spread: number } | null {
  const [x0, y0, w, h] = rect;
  const grid = Math.ceil(w / step) * Math.ceil(h / step);
  const scratch = (buffers.scratch = scratchFor(buffers.scratch, grid));
  const { sums, work, channel, pixels } = scratch;
  const data = image.data;
  let n = 0;
  for (let y = y0; y < y0 + h; y += step) {
    for (let x = x0, i = (y * image.width + x0) * 3; x < x0 + w; x += step, i += 3 * step) {
      const r = data[i]!,
        g = data[i + 1]!,
        b = data[i + 2]!;
      if (r >= clip || g >= clip || b >= clip) continue;
      pixels[3 * n] = r;
      pixels[3 * n + 1] = g;
      pixels[3 * n + 2] = b;
      sums[n++] = r + g + b;
    }
  }
  if (n < Math.max(4, grid / 4)) return null;
  const order = work.subarray(0, n);
  order.set(sums.subarray(0, n));
  const [sumLo, sumHi] = middlePair(order);
  const mSum = 0.5 * (sumLo + sumHi);
  const floor = DUST_FRACTION * mSum;
  // Deviations of the kept (not dust) sums from the median, for the evenness measure (an even count's median of
  // sums may end in .5, so they are kept doubled, in whole numbers).
  let kept = 0;
  for (let k = 0; k < n; k++) if (sums[k]! >= floor) order[kept++] = Math.abs(2 * sums[k]! - sumLo - sumHi);
  const [devLo, devHi] = middlePair(order.subarray(0, kept));
  const mad = 0.25 * (devLo + devHi);
  const spread = mSum > 0 ? mad / mSum : 1;
  if (spread > maxSpread) return null;
  const rgb: Rgb = [0, 0, 0];
  for (let c = 0 as 0 | 1 | 2; c < 3; c++) {
    let m = 0;
    for (let k = 0; k < n; k++) if (sums[k]! >= floor) channel[m++] = pixels[3 * k + c]!;
    rgb[c] = linearMedian(channel.subarray(0, m), scanner, c);
  }
  return { rgb, used: kept, spread };
}

/**
 * Film base of an operator-drawn rectangle: per-channel median of its film pixels (bare light and dust left out).
 * Confidence 0 when the rectangle is outside the image or holds no film.
 * @example baseFromRegion(image, LINEAR_SCANNER, [0, 0, 200, 40]).rgb // e.g. [0.81, 0.79, 0.74]
 */
export function baseFromRegion(
  image: RgbImage,
  scanner: ScannerProfile,
  rect: Region,
  options: DetectFilmBaseOptions = {},
): FilmBase {
  const [x, y, w, h] = rect.map(Math.round) as Region;
  if (x < 0 || y < 0 || w < 1 || h < 1 || x + w > image.width || y + h > image.height)
    return { rgb: [0, 0, 0], region: rect, confidence: 0 };
  const clip = options.clipCount ?? DEFAULT_CLIP_FRACTION * FULL_SCALE_16;
  const s = sampleRect(image, scanner, [x, y, w, h], clip, sampleStep(w, h), { scratch: null });
  if (!s) return { rgb: [0, 0, 0], region: [x, y, w, h], confidence: 0 };
  return { rgb: s.rgb, region: [x, y, w, h], confidence: Math.max(0, Math.min(1, 1 - s.spread / EVENNESS)) };
}

/** One block examined by base detection that is even enough to be base. */
export interface BaseBlock {
  rect: Region;
  /** Per-channel medians, linear light. */
  rgb: Rgb;
  used: number;
  spread: number;
  /** Sum of the medians, to find the least dense blocks. */
  level: number;
}

/** How detection divides an image into blocks: their side, the sampling step, and how many rows of blocks. */
export function baseBlockLayout(
  image: Pick<RgbImage, 'width' | 'height'>,
  options: DetectFilmBaseOptions = {},
): { size: number; step: number; blockRows: number } {
  const size = options.blockSize ?? Math.max(4, Math.floor(Math.min(image.width, image.height) / 40));
  // Each block is sampled on the same grid, at most MAX_BASE_SAMPLES pixels over the image and 4 × 4 per block.
  const step = Math.min(Math.max(1, Math.floor(size / 4)), sampleStep(image.width, image.height));
  return { size, step, blockRows: Math.floor(image.height / size) };
}

/**
 * The even blocks of film among rows [firstRow, endRow) of detection's blocks (all by default), in row order:
 * the first half of `detectFilmBase`, which parts of an image can do apart (on worker threads) and
 * `baseFromBlocks` then joins, in the same order, into the same base.
 */
export function examineBaseBlocks(
  image: RgbImage,
  scanner: ScannerProfile,
  options: DetectFilmBaseOptions = {},
  firstRow = 0,
  endRow = Number.POSITIVE_INFINITY,
): BaseBlock[] {
  const clip = options.clipCount ?? DEFAULT_CLIP_FRACTION * FULL_SCALE_16;
  const { size, step, blockRows } = baseBlockLayout(image, options);
  const buffers = { scratch: null as Scratch | null };
  const blocks: BaseBlock[] = [];
  for (let row = Math.max(0, firstRow); row < Math.min(blockRows, endRow); row++) {
    const y = row * size;
    for (let x = 0; x + size <= image.width; x += size) {
      const s = sampleRect(image, scanner, [x, y, size, size], clip, step, buffers, EVENNESS);
      if (!s) continue;
      blocks.push({ rect: [x, y, size, size], ...s, level: s.rgb[0] + s.rgb[1] + s.rgb[2] });
    }
  }
  return blocks;
}

/**
 * Finds the film base: examines square blocks over the image (rebate strips, inter-frame gaps and the
 * frame alike), keeps even blocks of film (bare light and dust left out), and takes the per-channel
 * median of the least dense ones. Confidence falls with few base blocks or uneven ones; 0 = flag for QC.
 * @example detectFilmBase(negative, LINEAR_SCANNER) // { rgb: [0.81, 0.79, 0.74], region: [0, 0, 3000, 120], confidence: 0.9 }
 */
export function detectFilmBase(
  image: RgbImage,
  scanner: ScannerProfile,
  options: DetectFilmBaseOptions = {},
): FilmBase {
  return baseFromBlocks(examineBaseBlocks(image, scanner, options), options);
}

/** The second half of `detectFilmBase`: the base from the even blocks of the whole image, in row order. */
export function baseFromBlocks(blocks: BaseBlock[], options: DetectFilmBaseOptions = {}): FilmBase {
  const tolerance = options.tolerance ?? 0.02;
  if (!blocks.length) return { rgb: [0, 0, 0], region: [0, 0, 0, 0], confidence: 0 };
  const size = blocks[0]!.rect[2];
  const top = Math.max(...blocks.map((b) => b.level));
  const chosen = blocks.filter((b) => b.level >= (1 - tolerance) * top);
  const rgb: Rgb = [
    median(chosen.map((b) => b.rgb[0])),
    median(chosen.map((b) => b.rgb[1])),
    median(chosen.map((b) => b.rgb[2])),
  ];
  // Report one strip an operator can check: the row or column of blocks holding most base blocks.
  const count = (key: (b: BaseBlock) => number) => {
    const m = new Map<number, BaseBlock[]>();
    for (const b of chosen) {
      const group = m.get(key(b));
      if (group) group.push(b);
      else m.set(key(b), [b]);
    }
    return [...m.values()].reduce((a, b) => (b.length > a.length ? b : a));
  };
  const byRow = count((b) => b.rect[1]),
    byColumn = count((b) => b.rect[0]);
  const strip = byRow.length >= byColumn.length ? byRow : byColumn;
  const x0 = Math.min(...strip.map((b) => b.rect[0])),
    y0 = Math.min(...strip.map((b) => b.rect[1]));
  const x1 = Math.max(...strip.map((b) => b.rect[0] + size)),
    y1 = Math.max(...strip.map((b) => b.rect[1] + size));
  // Confidence: enough base blocks (8 or more count as plenty, from memory) and even ones.
  const evenness = 1 - median(chosen.map((b) => b.spread)) / EVENNESS;
  const confidence = Math.max(0, Math.min(1, Math.min(1, chosen.length / 8) * evenness));
  return { rgb, region: [x0, y0, x1 - x0, y1 - y0], confidence };
}

/**
 * Roll base: per-channel median of the frames' bases that have any confidence; confidence is their median.
 * @example rollBase([a, b, c]).rgb // per-channel median
 */
export function rollBase(bases: FilmBase[]): FilmBase {
  const usable = bases.filter((b) => b.confidence > 0);
  if (!usable.length) return { rgb: [0, 0, 0], region: [0, 0, 0, 0], confidence: 0 };
  const best = usable.reduce((a, b) => (b.confidence > a.confidence ? b : a));
  return {
    rgb: [
      median(usable.map((b) => b.rgb[0])),
      median(usable.map((b) => b.rgb[1])),
      median(usable.map((b) => b.rgb[2])),
    ],
    region: best.region,
    confidence: median(usable.map((b) => b.confidence)),
  };
}
