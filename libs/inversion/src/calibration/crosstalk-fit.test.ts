import { describe, expect, it } from 'vitest';
import { createMonotoneCurve } from '../monotone-curve';
import { invert3, multiply3, type Matrix3, type Rgb } from '../srgb';
import { fitCrosstalk } from './crosstalk-fit';

const M: Matrix3 = [
  [1.1, -0.08, -0.02],
  [-0.06, 1.12, -0.06],
  [-0.02, -0.14, 1.16],
];
const gamma: Rgb = [0.55, 0.62, 0.7];
const xs = [-2, -1, 0, 1, 2];
// Measured curves of a neutral: G = M⁻¹ · F(x), F straight lines of slope γ through 0.7 at x = 0.
const G = [0, 1, 2].map((c) =>
  createMonotoneCurve(
    xs,
    xs.map((x) => multiply3(invert3(M), gamma.map((g) => 0.7 + g * x) as Rgb)[c]!),
  ),
) as [
  ReturnType<typeof createMonotoneCurve>,
  ReturnType<typeof createMonotoneCurve>,
  ReturnType<typeof createMonotoneCurve>,
];

function patch(logExposure: Rgb) {
  return {
    densities: multiply3(invert3(M), gamma.map((g, c) => 0.7 + g * logExposure[c]!) as Rgb),
    logExposure,
  };
}

describe('crosstalk fit', () => {
  const samples = [
    [0.3, -0.2, -0.5],
    [-0.6, 0.1, 0.2],
    [0.1, 0.4, -0.3],
    [-0.2, -0.4, 0.5],
    [0.5, 0.5, 0.5],
    [0, -0.7, 0.3],
  ].map((e) => patch(e as Rgb));

  it('recovers a known matrix from exact densities, each row summing to 1', () => {
    const fit = fitCrosstalk(samples, G, 0);
    fit.matrix.forEach((row, r) => row.forEach((v, k) => expect(v).toBeCloseTo(M[r]![k]!, 6)));
    fit.residualRms.forEach((v) => expect(v).toBeLessThan(1e-9));
    expect(fit.used).toEqual([6, 6, 6]);
  });

  it('leaves out a channel whose published colour is out of gamut (NaN exposure)', () => {
    const fit = fitCrosstalk(
      [...samples, { densities: [0.5, 0.5, 0.5], logExposure: [Number.NaN, 0, 0] }],
      G,
    );
    expect(fit.used).toEqual([6, 7, 7]);
  });

  it('falls back towards the identity when the chart holds only neutrals', () => {
    const fit = fitCrosstalk([patch([0, 0, 0]), patch([0.4, 0.4, 0.4])], G);
    fit.matrix.forEach((row, r) => row.forEach((v, k) => expect(v).toBeCloseTo(r === k ? 1 : 0, 6)));
  });
});
