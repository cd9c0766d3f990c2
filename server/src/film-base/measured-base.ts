import type { MeasuredBase } from '@clearbase/contracts';
import type { FilmBase } from '@clearbase/inversion';

/** A film base as the API stores it: rgb rounded to 6 places, confidence to 4 and clamped to 0..1, region as an object. */
export function toMeasuredBase(base: FilmBase): MeasuredBase {
  const [x, y, width, height] = base.region;
  return {
    rgb: base.rgb.map((v) => Number(v.toFixed(6))) as MeasuredBase['rgb'],
    region: width > 0 && height > 0 ? { x, y, width, height } : null,
    confidence: Number(Math.max(0, Math.min(1, base.confidence)).toFixed(4)),
  };
}

/** A stored base as the inversion library takes it (a base with no region has the empty rectangle). */
export function toFilmBase(base: MeasuredBase): FilmBase {
  const r = base.region;
  return {
    rgb: base.rgb,
    region: r ? [r.x, r.y, r.width, r.height] : [0, 0, 0, 0],
    confidence: base.confidence,
  };
}
