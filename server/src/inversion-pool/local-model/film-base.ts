import type { Rgb } from './inversion-plan';
import { LINEAR_SCANNER, type ScannerProfile } from './stock-profile';

export type Region = [x: number, y: number, width: number, height: number];

export interface FilmBase {
  /** Linear transmitted light of the base, 0–1 of full scale, per channel. */
  rgb: Rgb;
  region: Region;
  /** 0 (no usable base found) … 1 (large, even, clearly the least dense film). */
  confidence: number;
}

export interface RgbImage {
  width: number;
  height: number;
  data: Uint16Array;
}

// Counts this close to full scale are bare light (sprocket holes, gaps), not film; from memory.
const CLIP = 0.985 * 65535;
// Coefficient of variation above which a block is texture rather than even base; from memory.
const EVEN = 0.03;

function linear(code: number, scanner: ScannerProfile): number {
  const x = code / 65535;
  const v =
    scanner.encoding === 'srgb'
      ? x <= 0.04045
        ? x / 12.92
        : ((x + 0.055) / 1.055) ** 2.4 // IEC 61966-2-1
      : scanner.encoding === 'gamma'
        ? x ** scanner.gamma
        : x;
  return (v - scanner.blackLevel) / (1 - scanner.blackLevel);
}

function medianOf(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? s[s.length >> 1]! : 0;
}

/** Per-channel median of a rectangle, in linear light. Pixels of bare light are left out. */
export function baseFromRegion(
  image: RgbImage,
  region: Region,
  scanner: ScannerProfile = LINEAR_SCANNER,
): FilmBase {
  const [x0, y0, w, h] = region;
  if (x0 < 0 || y0 < 0 || w < 1 || h < 1 || x0 + w > image.width || y0 + h > image.height) {
    throw new RangeError(
      `Expected a region inside the ${image.width} × ${image.height} image but received ${region.join(',')}`,
    );
  }
  const step = Math.max(1, Math.floor(Math.sqrt((w * h) / 20000)));
  const ch: number[][] = [[], [], []];
  let clipped = 0;
  for (let y = y0; y < y0 + h; y += step) {
    for (let x = x0; x < x0 + w; x += step) {
      const i = (y * image.width + x) * 3;
      const r = image.data[i]!,
        g = image.data[i + 1]!,
        b = image.data[i + 2]!;
      if (r >= CLIP || g >= CLIP || b >= CLIP) {
        clipped++;
        continue;
      }
      ch[0]!.push(r);
      ch[1]!.push(g);
      ch[2]!.push(b);
    }
  }
  const total = clipped + ch[0]!.length;
  const rgb = ch.map((v) => linear(medianOf(v), scanner)) as Rgb;
  return { rgb, region, confidence: ch[0]!.length === 0 ? 0 : ch[0]!.length / total };
}

/**
 * Finds the film base: the brightest even patch of film that is not bare light. Works on a grid
 * of blocks; a block with clipped pixels or uneven texture is skipped.
 */
export function detectFilmBase(image: RgbImage, scanner: ScannerProfile = LINEAR_SCANNER): FilmBase {
  const block = Math.max(8, Math.round(Math.min(image.width, image.height) / 40));
  const step = Math.max(1, Math.floor(block / 8));
  let best: { x: number; y: number; mean: number; cv: number } | null = null;
  const means: number[] = [];
  for (let by = 0; by + block <= image.height; by += block) {
    for (let bx = 0; bx + block <= image.width; bx += block) {
      let n = 0,
        sum = 0,
        sum2 = 0,
        clipped = false;
      for (let y = by; y < by + block && !clipped; y += step) {
        for (let x = bx; x < bx + block; x += step) {
          const i = (y * image.width + x) * 3;
          const r = image.data[i]!,
            g = image.data[i + 1]!,
            b = image.data[i + 2]!;
          if (r >= CLIP || g >= CLIP || b >= CLIP) {
            clipped = true;
            break;
          }
          const l = r + g + b;
          n++;
          sum += l;
          sum2 += l * l;
        }
      }
      if (clipped || n === 0) continue;
      const mean = sum / n;
      const cv = Math.sqrt(Math.max(0, sum2 / n - mean * mean)) / (mean || 1);
      means.push(mean);
      if (cv <= EVEN && (!best || mean > best.mean)) best = { x: bx, y: by, mean, cv };
    }
  }
  if (!best) return { rgb: [1, 1, 1], region: [0, 0, 0, 0], confidence: 0 };
  const base = baseFromRegion(image, [best.x, best.y, block, block], scanner);
  // Confident when the patch is even and clearly brighter (thinner) than the typical frame area.
  const separation = Math.min(1, Math.max(0, (best.mean / (medianOf(means) || 1) - 1) / 0.3));
  const evenness = 1 - best.cv / EVEN;
  return {
    ...base,
    confidence:
      Math.round(Math.min(base.confidence, 0.5 + 0.5 * separation) * (0.7 + 0.3 * evenness) * 1000) / 1000,
  };
}

/** Roll base: per-channel median of the frames' bases, leaving out frames with confidence below 0.3. */
export function rollBase(bases: FilmBase[]): FilmBase {
  const usable = bases.filter((b) => b.confidence >= 0.3);
  if (usable.length === 0) return { rgb: [1, 1, 1], region: [0, 0, 0, 0], confidence: 0 };
  const rgb = [0, 1, 2].map((c) => medianOf(usable.map((b) => b.rgb[c]!))) as Rgb;
  const nearest = usable.reduce((a, b) => (dist(a.rgb, rgb) <= dist(b.rgb, rgb) ? a : b));
  return { rgb, region: nearest.region, confidence: medianOf(usable.map((b) => b.confidence)) };
}

function dist(a: Rgb, b: Rgb): number {
  return Math.abs(a[0] - b[0]) + Math.abs(a[1] - b[1]) + Math.abs(a[2] - b[2]);
}
