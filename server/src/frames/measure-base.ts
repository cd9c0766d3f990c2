import type { MeasuredBase, PixelRegion, ScannerProfile } from '@clearbase/contracts';
import { baseFromRegion, detectFilmBase, type FilmBase, type RgbImage } from '@clearbase/inversion';

/** A film base as the API stores it: rgb rounded to 6 places, region as an object. */
export function toMeasuredBase(base: FilmBase): MeasuredBase {
  const [x, y, width, height] = base.region;
  return {
    rgb: base.rgb.map((v) => Number(v.toFixed(6))) as MeasuredBase['rgb'],
    region: width > 0 && height > 0 ? { x, y, width, height } : null,
    confidence: Number(Math.max(0, Math.min(1, base.confidence)).toFixed(4)),
  };
}

/** Measures a negative's base automatically, or in an operator's rectangle. */
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
