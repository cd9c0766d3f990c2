import { describe, expect, it } from 'vitest';
import { chartGridFromCorners, chartGridFromRegion } from './chart-grid';

describe('chart grid', () => {
  it('lays 4 × 6 patches over an axis-aligned region, sampling each cell’s central half', () => {
    const grid = chartGridFromRegion([0, 0, 600, 400]);
    expect(grid.patches).toHaveLength(24);
    const p8 = grid.patches[7]!;
    expect([p8.row, p8.column]).toEqual([1, 1]);
    const expected = [
      [125, 125],
      [175, 125],
      [175, 175],
      [125, 175],
    ];
    p8.sample.forEach((pt, k) => {
      expect(pt[0]).toBeCloseTo(expected[k]![0]!, 9);
      expect(pt[1]).toBeCloseTo(expected[k]![1]!, 9);
    });
    expect(p8.cell[0]).toEqual([expect.closeTo(100, 9), expect.closeTo(100, 9)]);
  });

  it('follows the chart with perspective from four corners, patch 1 at the first corner', () => {
    // A chart rotated a half turn on the frame: patch 1's corner is bottom right.
    const grid = chartGridFromCorners([
      [600, 400],
      [0, 400],
      [0, 0],
      [600, 0],
    ]);
    const centre = (q: [number, number][]) => [
      q.reduce((s, p) => s + p[0], 0) / 4,
      q.reduce((s, p) => s + p[1], 0) / 4,
    ];
    expect(centre(grid.patches[0]!.sample)).toEqual([expect.closeTo(550, 6), expect.closeTo(350, 6)]);
    expect(centre(grid.patches[23]!.sample)).toEqual([expect.closeTo(50, 6), expect.closeTo(50, 6)]);
  });

  it('shrinks patches on the far side of a foreshortened chart', () => {
    const grid = chartGridFromCorners([
      [0, 0],
      [600, 50],
      [600, 350],
      [0, 400],
    ]);
    const width = (i: number) => grid.patches[i]!.cell[1][0] - grid.patches[i]!.cell[0][0];
    expect(width(5)).toBeLessThan(width(0));
  });

  it('checks its options before any work', () => {
    expect(() => chartGridFromRegion([0, 0, 600, 400], { inner: 0 })).toThrow(
      'Expected number above 0 and at most 1 for inner but received 0 of type number',
    );
    expect(() => chartGridFromRegion([0, 0, 600, 400], { rows: 2.5 })).toThrow(
      'Expected integer between 1 and 100 for rows but received 2.5 of type number',
    );
    expect(() => chartGridFromRegion([0, 0, 0, 400])).toThrow(/width and height above 0/);
  });
});
