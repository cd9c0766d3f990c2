import { describe, expect, it } from 'vitest';
import { filmDensity, POLYCLEAR_200 } from '../forward-model';
import { fitCharacteristicCurve, leastSquaresLine } from './characteristic-curve-fit';

const LOG2 = Math.log10(2);
const series = (from: number, to: number, step: number, f: (x: number) => number) => {
  const out = [];
  for (let s = from; s <= to + 1e-9; s += step) out.push({ logExposure: s * LOG2, density: f(s * LOG2) });
  return out;
};

describe('characteristic curve fit', () => {
  it('finds γ exactly on a straight line and reports no toe or shoulder within the range', () => {
    const fit = fitCharacteristicCurve(series(-3, 4, 1 / 3, (x) => 0.7 + 0.6 * x));
    expect(fit.gamma).toBeCloseTo(0.6, 12);
    expect(fit.straightPart.intercept).toBeCloseTo(0.7, 12);
    expect([fit.toe, fit.shoulder, fit.adjusted]).toEqual([null, null, false]);
    expect(fit.points).toHaveLength(22);
  });

  it('recovers γ within 1 % on the forward model’s curve with toe and shoulder, and places both', () => {
    // Green of an invented stock with its toe moved up and shoulder down into the bracket.
    const stock = {
      ...POLYCLEAR_200,
      toe: [-1.6, -1.6, -1.6] as [number, number, number],
      maxDensity: [1.6, 1.6, 1.6] as [number, number, number],
    };
    const fit = fitCharacteristicCurve(
      series(-4, 8, 1 / 3, (x) => filmDensity(stock, 1, x + Math.log10(0.18))),
    );
    expect(Math.abs(fit.gamma / 0.63 - 1)).toBeLessThan(0.01);
    expect(fit.toe).not.toBeNull();
    expect(fit.shoulder).not.toBeNull();
    expect(fit.toe!.logExposure).toBeLessThan(fit.straightPart.to);
    expect(fit.shoulder!.density).toBeLessThan(1.6);
  });

  it('sorts the points and averages repeated exposures', () => {
    const fit = fitCharacteristicCurve([
      { logExposure: 0.3, density: 0.9 },
      { logExposure: 0, density: 0.69 },
      { logExposure: 0, density: 0.71 },
      { logExposure: -0.3, density: 0.5 },
    ]);
    expect(fit.points).toEqual([
      { logExposure: -0.3, density: 0.5 },
      { logExposure: 0, density: expect.closeTo(0.7, 12) },
      { logExposure: 0.3, density: 0.9 },
    ]);
  });

  it('makes a series that goes down monotone by isotonic regression and says so', () => {
    const points = series(-3, 3, 1, (x) => 0.7 + 0.6 * x);
    points[3]!.density = points[4]!.density + 0.05;
    const fit = fitCharacteristicCurve(points);
    expect(fit.adjusted).toBe(true);
    expect(fit.residualRms).toBeGreaterThan(0);
    for (let i = 1; i < fit.points.length; i++) {
      expect(fit.points[i]!.density).toBeGreaterThan(fit.points[i - 1]!.density);
      expect(fit.points[i]!.logExposure).toBeGreaterThan(fit.points[i - 1]!.logExposure);
    }
  });

  it('refuses a series with one exposure or no rise', () => {
    expect(() => fitCharacteristicCurve([{ logExposure: 0, density: 1 }])).toThrow(
      'Expected at least 2 distinct log exposures but received 1',
    );
    expect(() =>
      fitCharacteristicCurve([
        { logExposure: 0, density: 1 },
        { logExposure: 1, density: 0.5 },
      ]),
    ).toThrow('Expected densities that rise with exposure but received a series with no rise');
  });

  it('fits a least-squares line', () => {
    expect(leastSquaresLine([0, 1, 2], [1, 3, 5])).toEqual({ slope: 2, intercept: 1, residualRms: 0 });
  });
});
