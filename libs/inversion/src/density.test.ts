import fc from 'fast-check';
import type { ScannerProfile } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  balanceToLogExposure,
  createMonotoneCurve,
  densityAboveBase,
  densityFromTransmittance,
  pchipSlopes,
  pointsToLogExposure,
  stopsToLogExposure,
  transmittanceFromDensity,
  type Rgb,
} from './index';
import { densityTable } from './inversion-tables';
import { DENSITY_RANGE } from './invert-pixel';
import { linearise, LINEAR_SCANNER } from './scanner-input';

describe('density (ISO 5-1 notation, ISO 5-2 geometry; /work/shared/reference/facts.md)', () => {
  it('gives density 1.00 for 10 % transmittance', () =>
    expect(densityFromTransmittance(0.1)).toBeCloseTo(1, 12));
  it('measures density above the base, whatever the base colour', () => {
    expect(densityAboveBase(0.08, 0.8)).toBeCloseTo(1, 12);
    expect(transmittanceFromDensity(densityFromTransmittance(0.37))).toBeCloseTo(0.37, 12);
  });
});

describe('density table', () => {
  const scanners: ScannerProfile[] = [
    LINEAR_SCANNER,
    { ...LINEAR_SCANNER, name: 'sRGB', encoding: 'srgb', blackLevel: [0.01, 0.02, 0.015] },
    { ...LINEAR_SCANNER, name: 'Gamma', encoding: 'gamma', gamma: 2.2, gains: [1.1, 1, 0.9] },
  ];
  const bases: Rgb[] = [
    [0.8, 0.7, 0.6],
    [0.31, 0.05, 0.9],
  ];
  it('holds densityAboveBase of every count, held to the density range, for each kind of scanner and base', () => {
    const [lo, hi] = DENSITY_RANGE;
    for (const scanner of scanners)
      for (const base of bases) {
        const table = densityTable(scanner, base);
        let worst = 0;
        for (let c = 0 as 0 | 1 | 2; c < 3; c++)
          for (let v = 0; v < 65536; v += 7) {
            const d = densityAboveBase(linearise(v / 65535, scanner, c), base[c]);
            worst = Math.max(worst, Math.abs(table[c * 65536 + v]! - Math.min(hi, Math.max(lo, d))));
          }
        // Float32 keeps 24 bits: 4.5 D is held to about 2.4e-7.
        expect(worst).toBeLessThan(5e-7);
      }
  });
});

describe('printer points and stops', () => {
  it('moves log exposure by 0.30 for 12 printer points (common practice of the trade, from memory)', () =>
    expect(pointsToLogExposure(12)).toBeCloseTo(0.3, 12));
  it('moves log exposure by log10 2 for one stop (facts.md)', () =>
    expect(stopsToLogExposure(1)).toBeCloseTo(0.30103, 5));
  it('adds exposure to the channel named by the positive colour: +red, +green, +blue', () =>
    expect(balanceToLogExposure({ cyanRed: 4, magentaGreen: -8, yellowBlue: 12 })).toEqual([
      0.1, -0.2, 0.30000000000000004,
    ]));
});

describe('monotone cubic (Fritsch & Carlson 1980; SciPy PchipInterpolator check values in facts.md)', () => {
  const xs = [0, 1, 2, 3, 4],
    ys = [0, 1, 1, 2, 5];
  it('has knot slopes 1.5, 0, 0, 1.5, 4', () =>
    pchipSlopes(xs, ys).forEach((d, i) => expect(d).toBeCloseTo([1.5, 0, 0, 1.5, 4][i]!, 12)));
  it('evaluates 0.6875, 1, 1.3125, 3.1875 at the half points', () => {
    const c = createMonotoneCurve(xs, ys);
    [0.5, 1.5, 2.5, 3.5].forEach((x, i) =>
      expect(c.evaluate(x)).toBeCloseTo([0.6875, 1, 1.3125, 3.1875][i]!, 12),
    );
  });
  it('extrapolates with the end slope but never flatter than the floor', () => {
    const c = createMonotoneCurve([0, 1, 2], [0, 0.01, 1], 0.2);
    expect(c.evaluate(-1)).toBeCloseTo(-0.2, 12);
    expect(c.inverse(-0.2)).toBeCloseTo(-1, 12);
  });
  it('round-trips log exposure through any increasing curve (property)', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.double({ min: 0.05, max: 1, noNaN: true }),
            fc.double({ min: 0.01, max: 1.5, noNaN: true }),
          ),
          { minLength: 2, maxLength: 12 },
        ),
        fc.double({ min: -3, max: 12, noNaN: true }),
        (steps, x) => {
          const px = [0],
            py = [0];
          for (const [dx, dy] of steps) {
            px.push(px.at(-1)! + dx);
            py.push(py.at(-1)! + dy);
          }
          const c = createMonotoneCurve(px, py);
          expect(c.inverse(c.evaluate(x))).toBeCloseTo(x, 7);
        },
      ),
    );
  });
});
