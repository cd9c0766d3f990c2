import { describe, expect, it } from 'vitest';
import { labD50ToLabD65, labD50ToLinearSrgb } from '../forward-model';
import { createMonotoneCurve, type MonotoneCurve } from '../monotone-curve';
import { invert3, multiply3, type Matrix3, type Rgb } from '../srgb';
import { CHART_REFERENCE } from './chart-reference';
import { fitColourMatrices, reproducePatch } from './colour-matrix-fit';

// A film in closed form: exposures H = S · rgb (S rows summing to 1), straight curves of slope γ through 0.7 at the
// metered grey, dye densities mixed by C = M⁻¹ (M rows summing to 1). The fit must find M and P = S⁻¹.
const S: Matrix3 = [
  [0.8, 0.17, 0.03],
  [0.06, 0.86, 0.08],
  [0.02, 0.13, 0.85],
];
const M: Matrix3 = [
  [1.08, -0.06, -0.02],
  [-0.05, 1.1, -0.05],
  [-0.01, -0.12, 1.13],
];
const gamma: Rgb = [0.6, 0.64, 0.7];
const xs = Array.from({ length: 29 }, (_, i) => (-6 + i / 2) * Math.log10(2));
const mInv = invert3(M);
const measured = [0, 1, 2].map((c) =>
  createMonotoneCurve(
    xs,
    xs.map((x) => multiply3(mInv, gamma.map((g) => 0.7 + g * x) as Rgb)[c]!),
  ),
) as [MonotoneCurve, MonotoneCurve, MonotoneCurve];
const densitiesOf = (rgb: Rgb, offset: number): Rgb =>
  multiply3(mInv, multiply3(S, rgb).map((h, c) => 0.7 + gamma[c]! * (Math.log10(h / 0.18) + offset)) as Rgb);
const inGamut = CHART_REFERENCE.map((p) => labD50ToLinearSrgb(p.labD50)).filter((v) => v.every((x) => x > 0));
const IDENTITY: Matrix3 = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

describe('fitting the density crosstalk and the exposure-space matrix together', () => {
  const patches = CHART_REFERENCE.filter((p) => labD50ToLinearSrgb(p.labD50).every((x) => x > 0));
  const frame = { densities: inGamut.map((rgb) => densitiesOf(rgb, 0)), offset: 0 };
  const fit = fitColourMatrices({
    frames: [frame],
    // Truth: the chart's published L*a*b* D50 (McCamy et al. 1976, maker's 2016 values), Bradford-adapted to D65.
    reference: patches.map((p) => labD50ToLabD65(p.labD50)),
    measuredCurves: measured,
    bracketLogExposures: xs,
    prior: { crosstalk: IDENTITY, exposureMatrix: IDENTITY },
    usable: [frame.densities.map(() => true)],
    ridge: 0,
  });

  it('recovers both matrices of a film that mixes in exposure and in density, rows summing to 1', () => {
    const p = invert3(S);
    fit.crosstalk.forEach((row, r) => row.forEach((v, k) => expect(v).toBeCloseTo(M[r]![k]!, 2)));
    fit.exposureMatrix.forEach((row, r) => row.forEach((v, k) => expect(v).toBeCloseTo(p[r]![k]!, 2)));
    for (const m of [fit.crosstalk, fit.exposureMatrix])
      m.forEach((row) => expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 12));
    // CIEDE2000 as checked against Sharma, Wu & Dalal (2005) in delta-e's own tests.
    expect(fit.rmsDeltaE).toBeLessThan(0.05);
  });

  it('keeps a grey grey: the neutral axis is held whatever the matrices', () => {
    const lab = reproducePatch(
      densitiesOf([0.18, 0.18, 0.18], 0),
      0,
      fit.crosstalk,
      fit.curves,
      fit.exposureMatrix,
    );
    // Not 0: the sRGB matrix's rows (IEC 61966-2-1, 4 decimals) sum to its white only within 5e-5.
    expect(Math.abs(lab[1])).toBeLessThan(0.01);
    expect(Math.abs(lab[2])).toBeLessThan(0.01);
  });

  it('uses every frame given: a frame two stops over adds patches higher on the curves', () => {
    const over = {
      densities: inGamut.map((rgb) => densitiesOf(rgb, 2 * Math.log10(2))),
      offset: 2 * Math.log10(2),
    };
    const both = fitColourMatrices({
      frames: [frame, over],
      reference: patches.map((p) => labD50ToLabD65(p.labD50)),
      measuredCurves: measured,
      bracketLogExposures: xs,
      prior: { crosstalk: IDENTITY, exposureMatrix: IDENTITY },
      usable: [frame.densities.map(() => true), over.densities.map(() => true)],
      ridge: 0,
    });
    expect(both.rmsDeltaE).toBeLessThan(0.05);
    both.crosstalk.forEach((row, r) => row.forEach((v, k) => expect(v).toBeCloseTo(M[r]![k]!, 2)));
  });
});
