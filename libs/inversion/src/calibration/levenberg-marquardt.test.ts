import { describe, expect, it } from 'vitest';
import { levenbergMarquardt } from './levenberg-marquardt';

describe('Levenberg–Marquardt least squares', () => {
  // Rosenbrock's function as residuals (H. H. Rosenbrock, Comput. J. 3(3):175-184, 1960): minimum at (1, 1).
  it('finds the minimum of Rosenbrock’s valley from its classic start (−1.2, 1)', () => {
    const fit = levenbergMarquardt(([a, b]) => [1 - a!, 10 * (b! - a! * a!)], [-1.2, 1], {
      maxIterations: 200,
      tolerance: 1e-14,
    });
    expect(fit.parameters[0]).toBeCloseTo(1, 4);
    expect(fit.parameters[1]).toBeCloseTo(1, 4);
    expect(fit.cost).toBeLessThan(1e-8);
  });

  it('fits a straight line exactly in a few steps', () => {
    const xs = [0, 1, 2, 3, 4];
    const fit = levenbergMarquardt(([m, c]) => xs.map((x) => m! * x + c! - (2 * x + 1)), [0, 0]);
    expect(fit.parameters[0]).toBeCloseTo(2, 6);
    expect(fit.parameters[1]).toBeCloseTo(1, 6);
    expect(fit.iterations).toBeLessThan(10);
  });

  it('refuses a step into a region where the residuals are not finite', () => {
    // sqrt is NaN below 0: the fit must stay at or above it.
    const fit = levenbergMarquardt(([a]) => [Math.sqrt(a!) - 0.5, 0.1 * (a! + 3)], [1]);
    expect(fit.parameters[0]).toBeGreaterThanOrEqual(0);
    expect(Number.isFinite(fit.cost)).toBe(true);
  });
});
