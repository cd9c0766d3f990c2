import { describe, expect, it } from 'vitest';
import { diffDocuments, flattenDocument } from './diff-documents';

describe('flattenDocument', () => {
  it('names leaves with dots for keys and brackets for indices', () => {
    expect([
      ...flattenDocument({ curves: { red: { points: [{ density: 0 }, { density: 1.8 }] } }, saturation: 1 }),
    ]).toEqual([
      ['curves.red.points[0].density', 0],
      ['curves.red.points[1].density', 1.8],
      ['saturation', 1],
    ]);
  });
});

describe('diffDocuments', () => {
  it('lists only the parameters that changed, with before and after', () => {
    const before = {
      balance: { cyanRed: 0, magentaGreen: 0 },
      crosstalk: [
        [1, 0],
        [0, 1],
      ],
    };
    const after = {
      balance: { cyanRed: 0, magentaGreen: -3 },
      crosstalk: [
        [1, -0.05],
        [0, 1],
      ],
    };
    expect(diffDocuments(before, after)).toEqual([
      { path: 'balance.magentaGreen', before: 0, after: -3 },
      { path: 'crosstalk[0][1]', before: 0, after: -0.05 },
    ]);
  });

  it('shows points added or removed as null on the side that lacks them', () => {
    expect(diffDocuments({ p: [1] }, { p: [1, 2] })).toEqual([{ path: 'p[1]', before: null, after: 2 }]);
    expect(diffDocuments({ p: [1, 2] }, { p: [1] })).toEqual([{ path: 'p[1]', before: 2, after: null }]);
  });

  it('finds nothing between equal documents', () => {
    expect(diffDocuments({ a: { b: [1, 2] } }, { a: { b: [1, 2] } })).toEqual([]);
  });
});
