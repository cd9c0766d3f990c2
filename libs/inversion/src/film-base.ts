import type { ScannerProfile } from '@clearbase/contracts';
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

function median(values: number[]): number {
  if (!values.length) return 0;
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 ? s[n >> 1]! : 0.5 * (s[n / 2 - 1]! + s[n / 2]!);
}

/** Per-channel medians (linear light) of the unclipped pixels of a rectangle; dark specks left out. */
function sampleRect(
  image: RgbImage,
  scanner: ScannerProfile,
  rect: Region,
  clip: number,
): { rgb: Rgb; used: number; spread: number } | null {
  const [x0, y0, w, h] = rect;
  const ch: [number[], number[], number[]] = [[], [], []];
  const sums: number[] = [];
  for (let y = y0; y < y0 + h; y++) {
    for (let x = x0; x < x0 + w; x++) {
      const i = (y * image.width + x) * 3;
      const r = image.data[i]!,
        g = image.data[i + 1]!,
        b = image.data[i + 2]!;
      if (r >= clip || g >= clip || b >= clip) continue;
      sums.push(r + g + b);
      ch[0].push(linearise(r / FULL_SCALE_16, scanner, 0));
      ch[1].push(linearise(g / FULL_SCALE_16, scanner, 1));
      ch[2].push(linearise(b / FULL_SCALE_16, scanner, 2));
    }
  }
  if (sums.length < Math.max(4, (w * h) / 4)) return null;
  const mSum = median(sums);
  const keep = sums.map((s) => s >= DUST_FRACTION * mSum);
  const pick = (a: number[]) => median(a.filter((_, i) => keep[i]));
  const kept = sums.filter((_, i) => keep[i]);
  const mad = median(kept.map((s) => Math.abs(s - mSum)));
  return {
    rgb: [pick(ch[0]), pick(ch[1]), pick(ch[2])],
    used: kept.length,
    spread: mSum > 0 ? mad / mSum : 1,
  };
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
  const s = sampleRect(image, scanner, [x, y, w, h], clip);
  if (!s) return { rgb: [0, 0, 0], region: [x, y, w, h], confidence: 0 };
  return { rgb: s.rgb, region: [x, y, w, h], confidence: Math.max(0, Math.min(1, 1 - s.spread / EVENNESS)) };
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
  const clip = options.clipCount ?? DEFAULT_CLIP_FRACTION * FULL_SCALE_16;
  const size = options.blockSize ?? Math.max(4, Math.floor(Math.min(image.width, image.height) / 40));
  const tolerance = options.tolerance ?? 0.02;
  const blocks: { rect: Region; rgb: Rgb; used: number; spread: number; level: number }[] = [];
  for (let y = 0; y + size <= image.height; y += size) {
    for (let x = 0; x + size <= image.width; x += size) {
      const s = sampleRect(image, scanner, [x, y, size, size], clip);
      if (!s || s.spread > EVENNESS) continue;
      blocks.push({ rect: [x, y, size, size], ...s, level: s.rgb[0] + s.rgb[1] + s.rgb[2] });
    }
  }
  if (!blocks.length) return { rgb: [0, 0, 0], region: [0, 0, 0, 0], confidence: 0 };
  const top = Math.max(...blocks.map((b) => b.level));
  const chosen = blocks.filter((b) => b.level >= (1 - tolerance) * top);
  const rgb: Rgb = [
    median(chosen.map((b) => b.rgb[0])),
    median(chosen.map((b) => b.rgb[1])),
    median(chosen.map((b) => b.rgb[2])),
  ];
  // Report one strip an operator can check: the row or column of blocks holding most base blocks.
  const count = (key: (b: (typeof chosen)[number]) => number) => {
    const m = new Map<number, typeof chosen>();
    for (const b of chosen) m.set(key(b), [...(m.get(key(b)) ?? []), b]);
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
