import { Matrix, solve } from 'ml-matrix';
import type { MonotoneCurve } from '../monotone-curve';
import type { Matrix3, Rgb } from '../srgb';

/** One chart patch for the crosstalk fit. */
export interface CrosstalkSample {
  /** Measured densities above base (red, green, blue), before crosstalk. */
  densities: Rgb;
  /** The log exposure each channel received according to the patch's published value (NaN: out of gamut, left out). */
  logExposure: Rgb;
}

/** The fitted crosstalk matrix. */
export interface CrosstalkFit {
  /** Row-major M of D' = M·D; every row sums to 1. */
  matrix: Matrix3;
  /** Per row, RMS of (M·D)_c − F_c(log H_c) over the patches used, D. */
  residualRms: Rgb;
  /** Per row, how many patches were used. */
  used: [number, number, number];
}

/**
 * Weight of the pull of each row towards the identity, D² (chosen: a small ridge that only matters when the
 * chart cannot pin a row, e.g. too few usable patches; from memory).
 */
export const CROSSTALK_RIDGE = 1e-4;

/**
 * Dye crosstalk by least squares, one row per channel, between the chart's measured densities and the
 * densities its published values should give.
 *
 * The grey bracket gives each channel's measured curve G_k (density against log exposure, crosstalk
 * included). The profile's curves are F = M·G, so a neutral grey stays neutral for any M. A patch whose
 * channel c received log exposure x_c should then satisfy (M·D)_c = F_c(x_c) = Σ_k M_ck·G_k(x_c), i.e.
 * Σ_k M_ck·(D_k − G_k(x_c)) = 0. That is homogeneous in the row, so each row is constrained to sum to 1 —
 * which fixes the scale left free (a row scaled by any factor fits as well, with its curve scaled alike)
 * and keeps the densities of a neutral on the straight line where all channels agree. Solved with the
 * constraint substituted (m₂ = 1 − m₀ − m₁) as an ordinary least-squares problem (ml-matrix, SVD), with a
 * small ridge towards the identity.
 * @example fitCrosstalk(samples, [red, green, blue]).matrix[1] // e.g. [-0.05, 1.1, -0.05]
 */
export function fitCrosstalk(
  samples: readonly CrosstalkSample[],
  curves: readonly [MonotoneCurve, MonotoneCurve, MonotoneCurve],
  ridge = CROSSTALK_RIDGE,
): CrosstalkFit {
  const matrix: Rgb[] = [];
  const residualRms: number[] = [];
  const used: number[] = [];
  for (let c = 0; c < 3; c++) {
    const diffs: Rgb[] = [];
    for (const s of samples) {
      const x = s.logExposure[c]!;
      if (!Number.isFinite(x) || !s.densities.every(Number.isFinite)) continue;
      diffs.push([0, 1, 2].map((k) => s.densities[k]! - curves[k]!.evaluate(x)) as Rgb);
    }
    const rows = diffs.map((a) => [a[0] - a[2], a[1] - a[2]]);
    const rhs = diffs.map((a) => -a[2]);
    // Ridge rows pull (m0, m1) towards the identity row's values.
    const w = Math.sqrt(ridge);
    rows.push([w, 0], [0, w]);
    rhs.push(w * (c === 0 ? 1 : 0), w * (c === 1 ? 1 : 0));
    const m = solve(new Matrix(rows), Matrix.columnVector(rhs), true).to1DArray();
    const row: Rgb = [m[0]!, m[1]!, 1 - m[0]! - m[1]!];
    matrix.push(row);
    const sq = diffs.reduce((s, a) => s + (row[0] * a[0] + row[1] * a[1] + row[2] * a[2]) ** 2, 0);
    residualRms.push(diffs.length ? Math.sqrt(sq / diffs.length) : 0);
    used.push(diffs.length);
  }
  return {
    matrix: matrix as Matrix3,
    residualRms: residualRms as Rgb,
    used: used as [number, number, number],
  };
}
