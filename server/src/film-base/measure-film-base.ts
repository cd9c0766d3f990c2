import type { MeasuredBase, PixelRegion, ScannerProfile } from '@clearbase/contracts';
import {
  baseFromRegion,
  detectFilmBase,
  type FilmBase,
  type Region,
  type RgbImage,
} from '@clearbase/inversion';
import { FilmBaseError } from './film-base-error';
import { toMeasuredBase } from './measured-base';
import { MIN_BASE_CONFIDENCE } from './min-base-confidence';

/** Where a negative's base comes from: detected, sampled in a rectangle, or already known (a roll base). */
export interface FilmBaseRequest {
  base: 'auto' | Region | FilmBase;
  scanner: ScannerProfile;
}

/**
 * Measures a negative's film base the way `request.base` asks, with `detectFilmBase` or `baseFromRegion`; `reading`
 * gives the base detected while the negative was copied in (the same base, measured while its rows were in cache).
 * A base below `MIN_BASE_CONFIDENCE` comes with a warning. Throws `FilmBaseError` when no channel can be used.
 *
 * @example measureFilmBase(negative, { base: 'auto', scanner }) // { base: { rgb: [0.81, 0.79, 0.74], … }, warnings: [] }
 */
export function measureFilmBase(
  negative: RgbImage,
  request: FilmBaseRequest,
  reading?: { base(): FilmBase },
): { base: FilmBase; warnings: string[] } {
  const base =
    request.base === 'auto'
      ? (reading?.base() ?? detectFilmBase(negative, request.scanner))
      : Array.isArray(request.base)
        ? baseFromRegion(negative, request.scanner, request.base)
        : request.base;
  const warnings: string[] = [];
  if (!base.rgb.every((v) => v > 0 && v <= 1))
    throw new FilmBaseError(
      'No usable film base found; draw the base region by hand (--base x,y,w,h) over unexposed film.',
    );
  if (base.confidence < MIN_BASE_CONFIDENCE) {
    warnings.push(
      `No reliable film base found (confidence ${base.confidence.toFixed(2)}); check the frame, or draw the base region by hand.`,
    );
  }
  return { base, warnings };
}

/**
 * Measures a negative's base as the API stores it: detected automatically, or in an operator's rectangle.
 *
 * @example measureNegativeBase(negative, scanner, null) // { rgb: [0.81, 0.79, 0.74], region: { x: 0, … }, confidence: 0.9 }
 */
export function measureNegativeBase(
  negative: RgbImage,
  scanner: ScannerProfile,
  region: PixelRegion | null,
): MeasuredBase {
  const base = region
    ? baseFromRegion(negative, scanner, [region.x, region.y, region.width, region.height])
    : detectFilmBase(negative, scanner);
  return toMeasuredBase(base);
}
