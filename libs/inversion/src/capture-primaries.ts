import type { CapturePrimaries } from '@clearbase/contracts';
import { invert3, LINEAR_SRGB_TO_XYZ, type Matrix3 } from './srgb';

/**
 * Linear sRGB → linear ITU-R BT.2020 RGB: ITU-R BT.2087-0 (2015), the BT.709 → BT.2020 matrix (same D65 white, so
 * neutrals stay neutral). A film of 'wide' capture primaries records these three exposures of a scene.
 */
export const LINEAR_SRGB_TO_WIDE: Matrix3 = [
  [0.6274, 0.3293, 0.0433],
  [0.0691, 0.9195, 0.0114],
  [0.0164, 0.088, 0.8956],
];

/** Linear RGB in the wide capture primaries → linear sRGB: the inverse of `LINEAR_SRGB_TO_WIDE`. */
export const WIDE_TO_LINEAR_SRGB: Matrix3 = invert3(LINEAR_SRGB_TO_WIDE);

/**
 * Linear RGB in each named set of capture primaries → CIE XYZ (D65): the sRGB matrix (IEC 61966-2-1:1999), after
 * the inverse of `LINEAR_SRGB_TO_WIDE` for 'wide'.
 */
export const CAPTURE_PRIMARIES_TO_XYZ: Readonly<Record<CapturePrimaries, Matrix3>> = {
  srgb: LINEAR_SRGB_TO_XYZ,
  wide: multiplyMatrices(LINEAR_SRGB_TO_XYZ, WIDE_TO_LINEAR_SRGB),
};

/**
 * The matrix from a film's recorded exposures (linear, in its capture primaries) to linear sRGB, the output's
 * primaries; null when they are sRGB already (absent from the profile, or 'srgb'), so nothing is mixed.
 * @example capturePrimariesToSrgb('wide') // ≈ [[1.6605, −0.5876, −0.0728], …]; capturePrimariesToSrgb(undefined) // null
 */
export function capturePrimariesToSrgb(primaries: CapturePrimaries | undefined): Matrix3 | null {
  return primaries === 'wide' ? WIDE_TO_LINEAR_SRGB : null;
}

/**
 * Product of two 3×3 matrices, a · b.
 * @example multiplyMatrices(m, invert3(m)) // ≈ identity
 */
export function multiplyMatrices(a: Matrix3, b: Matrix3): Matrix3 {
  return a.map((row) =>
    [0, 1, 2].map((k) => row[0] * b[0][k]! + row[1] * b[1][k]! + row[2] * b[2][k]!),
  ) as Matrix3;
}
