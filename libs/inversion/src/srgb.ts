/** A triple of numbers, red, green, blue (or X, Y, Z; L*, a*, b*). */
export type Rgb = [number, number, number];
/** A row-major 3×3 matrix. */
export type Matrix3 = [Rgb, Rgb, Rgb];

/**
 * sRGB encoding of linear light (IEC 61966-2-1:1999), both 0..1.
 * @example srgbEncode(0.18) // 0.4613561295
 */
export function srgbEncode(linear: number): number {
  // IEC 61966-2-1:1999 transfer function.
  return linear <= 0.0031308 ? 12.92 * linear : 1.055 * linear ** (1 / 2.4) - 0.055;
}

/**
 * Linear light of an sRGB-encoded value (IEC 61966-2-1:1999), both 0..1.
 * @example srgbDecode(0.5) // 0.2140411405
 */
export function srgbDecode(encoded: number): number {
  // IEC 61966-2-1:1999 transfer function.
  return encoded <= 0.04045 ? encoded / 12.92 : ((encoded + 0.055) / 1.055) ** 2.4;
}

/** Linear sRGB → XYZ (D65, Y of white = 1), IEC 61966-2-1:1999. */
export const LINEAR_SRGB_TO_XYZ: Matrix3 = [
  [0.4124, 0.3576, 0.1805],
  [0.2126, 0.7152, 0.0722],
  [0.0193, 0.1192, 0.9505],
];

/** XYZ (D65) → linear sRGB, IEC 61966-2-1:1999. */
export const XYZ_TO_LINEAR_SRGB: Matrix3 = [
  [3.2406, -1.5372, -0.4986],
  [-0.9689, 1.8758, 0.0415],
  [0.0557, -0.204, 1.057],
];

/**
 * Multiplies a 3×3 matrix by a column vector.
 * @example multiply3([[1,0,0],[0,1,0],[0,0,1]], [1,2,3]) // [1,2,3]
 */
export function multiply3(m: Matrix3, v: Rgb): Rgb {
  return [
    m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2],
    m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2],
    m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2],
  ];
}

/**
 * Inverse of a 3×3 matrix (adjugate over determinant). Throws when singular.
 * @example invert3([[2,0,0],[0,2,0],[0,0,2]]) // [[0.5,0,0],[0,0.5,0],[0,0,0.5]]
 */
export function invert3(m: Matrix3): Matrix3 {
  const [[a, b, c], [d, e, f], [g, h, i]] = m;
  const A = e * i - f * h,
    B = -(d * i - f * g),
    C = d * h - e * g;
  const det = a * A + b * B + c * C;
  if (Math.abs(det) < 1e-12) throw new RangeError('matrix is singular');
  return [
    [A / det, -(b * i - c * h) / det, (b * f - c * e) / det],
    [B / det, (a * i - c * g) / det, -(a * f - c * d) / det],
    [C / det, -(a * h - b * g) / det, (a * e - b * d) / det],
  ];
}

/**
 * Linear sRGB → CIE XYZ (D65).
 * @example linearSrgbToXyz([1, 1, 1]) // ≈ [0.9505, 1.0000, 1.0890]
 */
export function linearSrgbToXyz(rgb: Rgb): Rgb {
  return multiply3(LINEAR_SRGB_TO_XYZ, rgb);
}

/**
 * CIE XYZ (D65) → linear sRGB.
 * @example xyzToLinearSrgb([0.9505, 1, 1.089]) // ≈ [1, 1, 1]
 */
export function xyzToLinearSrgb(xyz: Rgb): Rgb {
  return multiply3(XYZ_TO_LINEAR_SRGB, xyz);
}
