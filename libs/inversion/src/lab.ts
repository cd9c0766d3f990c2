import { multiply3, type Matrix3, type Rgb } from './srgb';

/** D65 white as XYZ, Y = 1 (white points pinned as in the Bradford matrix below; CIE 015:2018 chromaticities). */
export const D65_WHITE: Rgb = [0.95047, 1, 1.08883];
/** D50 white as XYZ, Y = 1 (CIE 015:2018 chromaticities, 4 decimals as commonly tabulated). */
export const D50_WHITE: Rgb = [0.96422, 1, 0.82521];

/** Bradford chromatic adaptation D50 → D65 with the whites above (derived from the Bradford cone matrix). */
export const BRADFORD_D50_TO_D65: Matrix3 = [
  [0.9555766, -0.0230393, 0.0631636],
  [-0.0282895, 1.0099416, 0.0210077],
  [0.0122982, -0.020483, 1.3299098],
];

// CIE 1976 L*a*b* constants (CIE 015:2018): ε = 216/24389, κ = 24389/27.
const EPSILON = 216 / 24389;
const KAPPA = 24389 / 27;

/**
 * CIE XYZ → CIE L*a*b* relative to a white (CIE 015:2018).
 * @example xyzToLab(D65_WHITE, D65_WHITE) // [100, 0, 0]
 */
export function xyzToLab(xyz: Rgb, white: Rgb): Rgb {
  const f = (t: number) => (t > EPSILON ? Math.cbrt(t) : (KAPPA * t + 16) / 116);
  const fx = f(xyz[0] / white[0]),
    fy = f(xyz[1] / white[1]),
    fz = f(xyz[2] / white[2]);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/**
 * CIE L*a*b* → CIE XYZ relative to a white (CIE 015:2018).
 * @example labToXyz([100, 0, 0], D50_WHITE) // D50_WHITE
 */
export function labToXyz(lab: Rgb, white: Rgb): Rgb {
  const fy = (lab[0] + 16) / 116;
  const fx = fy + lab[1] / 500;
  const fz = fy - lab[2] / 200;
  const inv = (f: number) => (f ** 3 > EPSILON ? f ** 3 : (116 * f - 16) / KAPPA);
  const yr = lab[0] > KAPPA * EPSILON ? fy ** 3 : lab[0] / KAPPA;
  return [inv(fx) * white[0], yr * white[1], inv(fz) * white[2]];
}

/**
 * Adapts D50 XYZ to D65 with the Bradford transform.
 * @example adaptD50ToD65(D50_WHITE) // ≈ D65_WHITE
 */
export function adaptD50ToD65(xyz: Rgb): Rgb {
  return multiply3(BRADFORD_D50_TO_D65, xyz);
}
