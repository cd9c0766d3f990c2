import type { Region, RgbImage } from './film-base';
import { filmLogExposure, resolveInversion, type InversionParams } from './invert-pixel';
import { MID_GREY } from './tone-curve';

/**
 * The reference rendering in floating point, for measuring colour: scene-linear values per channel (18 % grey
 * at E_mid, no tone curve, saturation 1) of every pixel of `region`, row by row, three floats a pixel. Nothing
 * is clipped to the output's range: a highlight above white stays above 1, and values are linear sRGB (the
 * profile's `capturePrimaries` converted, a colour outside sRGB keeping its negative component), or the film's own
 * primaries when the profile names none; ready for a matrix to XYZ and then L*a*b*.
 * Uses the plain per-pixel path (exact); `params.render` and `params.outputBits` are ignored.
 * Throws a RangeError (see `assertInversionParams`) on invalid params, or for a region outside the image.
 * @example renderReferenceLinear(params, negative, [100, 40, 8, 8]) // 64 × 3 floats, ≈ 0.18 each on a grey card
 */
export function renderReferenceLinear(
  params: InversionParams,
  image: RgbImage,
  region: Region = [0, 0, image.width, image.height],
): Float32Array {
  const [x0, y0, w, h] = region;
  if (![x0, y0, w, h].every(Number.isInteger) || x0 < 0 || y0 < 0 || w < 0 || h < 0)
    throw new RangeError(`Expected a region of non-negative integers but received [${region.join(', ')}]`);
  if (x0 + w > image.width || y0 + h > image.height)
    throw new RangeError(
      `Expected a region inside the ${image.width} × ${image.height} image but received [${region.join(', ')}]`,
    );
  const full: InversionParams = { ...params, render: 'reference' };
  const resolved = resolveInversion(full);
  // The change of primaries in linear light, unclipped (saturation is 1 in the reference rendering).
  const m = resolved.primaries;
  const out = new Float32Array(w * h * 3);
  let o = 0;
  for (let y = y0; y < y0 + h; y++) {
    for (let x = x0; x < x0 + w; x++, o += 3) {
      const i = (y * image.width + x) * 3;
      const e = filmLogExposure(resolved, full, [image.data[i]!, image.data[i + 1]!, image.data[i + 2]!]);
      const r = MID_GREY * 10 ** e[0],
        g = MID_GREY * 10 ** e[1],
        b = MID_GREY * 10 ** e[2];
      if (m) {
        out[o] = m[0][0] * r + m[0][1] * g + m[0][2] * b;
        out[o + 1] = m[1][0] * r + m[1][1] * g + m[1][2] * b;
        out[o + 2] = m[2][0] * r + m[2][1] * g + m[2][2] * b;
      } else {
        out[o] = r;
        out[o + 1] = g;
        out[o + 2] = b;
      }
    }
  }
  return out;
}
