import { Matrix, solve } from 'ml-matrix';

/** Options of `levenbergMarquardt`. */
export interface LevenbergMarquardtOptions {
  /** Most iterations (accepted or not). Default 60. */
  maxIterations?: number;
  /** Stop when an accepted step lowers the cost by less than this fraction. Default 1e-9. */
  tolerance?: number;
  /** Forward-difference step of the Jacobian, per parameter. Default 1e-6. */
  step?: number;
}

/** The minimum found and how it was reached. */
export interface LevenbergMarquardtResult {
  parameters: number[];
  /** Sum of squared residuals at `parameters`. */
  cost: number;
  iterations: number;
}

/**
 * Least squares by Levenberg–Marquardt: minimises Σ r_i(θ)² from a starting θ, the Jacobian by forward differences,
 * each step solving (JᵀJ + λ·diag(JᵀJ)) δ = −Jᵀr (D. W. Marquardt, "An algorithm for least-squares estimation of
 * nonlinear parameters", J. SIAM 11(2):431-441, 1963) with ml-matrix; λ shrinks tenfold after a step that lowers the
 * cost and grows tenfold after one that does not. Residuals that are not finite count as an infinite cost, so a
 * step into a region where the model breaks down is refused.
 * @example levenbergMarquardt(([a, b]) => [a - 1, 10 * (b - a * a)], [-1.2, 1]).parameters // ≈ [1, 1]
 */
export function levenbergMarquardt(
  residuals: (parameters: readonly number[]) => number[],
  start: readonly number[],
  options: LevenbergMarquardtOptions = {},
): LevenbergMarquardtResult {
  const maxIterations = options.maxIterations ?? 60;
  const tolerance = options.tolerance ?? 1e-9;
  const h = options.step ?? 1e-6;
  const costOf = (r: number[]) => {
    let s = 0;
    for (const v of r) s += v * v;
    return Number.isFinite(s) ? s : Infinity;
  };
  let theta = [...start];
  let r = residuals(theta);
  let cost = costOf(r);
  let lambda = 1e-3;
  let iterations = 0;
  let jacobian = numericJacobian(residuals, theta, r, h);
  while (iterations < maxIterations && cost > 0) {
    iterations++;
    const j = new Matrix(jacobian);
    const jt = j.transpose();
    const jtj = jt.mmul(j);
    const g = jt.mmul(Matrix.columnVector(r));
    const a = jtj.clone();
    for (let k = 0; k < theta.length; k++) a.set(k, k, jtj.get(k, k) * (1 + lambda) + 1e-12);
    const delta = solve(a, g.neg(), true).to1DArray();
    const next = theta.map((v, k) => v + delta[k]!);
    const rn = residuals(next);
    const cn = costOf(rn);
    if (cn < cost) {
      const gain = (cost - cn) / cost;
      theta = next;
      r = rn;
      cost = cn;
      lambda = Math.max(lambda / 10, 1e-9);
      // Relative gain tiny, or a residual vector already at rounding level (a fit that is exact).
      if (gain < tolerance || cost < 1e-24) break;
      jacobian = numericJacobian(residuals, theta, r, h);
    } else {
      lambda *= 10;
      if (lambda > 1e10) break;
    }
  }
  return { parameters: theta, cost, iterations };
}

/** Jacobian of `residuals` at θ by forward differences, row per residual. */
function numericJacobian(
  residuals: (parameters: readonly number[]) => number[],
  theta: readonly number[],
  r: readonly number[],
  h: number,
): number[][] {
  const rows = r.map(() => new Array<number>(theta.length).fill(0));
  for (let k = 0; k < theta.length; k++) {
    const moved = [...theta];
    moved[k] = theta[k]! + h;
    const rk = residuals(moved);
    for (let i = 0; i < r.length; i++) rows[i]![k] = (rk[i]! - r[i]!) / h;
  }
  return rows;
}
