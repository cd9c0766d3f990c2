import { describe, expect, it } from 'vitest';
import { applyHomography, solveHomography, type Point } from './homography';

const square: Point[] = [
  [0, 0],
  [1, 0],
  [1, 1],
  [0, 1],
];

describe('homography', () => {
  it('is a scale and shift for an axis-aligned rectangle', () => {
    const h = solveHomography(square, [
      [10, 10],
      [20, 10],
      [20, 20],
      [10, 20],
    ]);
    const expected = [
      [10, 0, 10],
      [0, 10, 10],
      [0, 0, 1],
    ];
    h.forEach((row, r) => row.forEach((v, c) => expect(v).toBeCloseTo(expected[r]![c]!, 10)));
  });

  it('maps the four corners of a tilted, foreshortened quadrilateral exactly, and keeps lines straight', () => {
    const quad: Point[] = [
      [100, 50],
      [700, 80],
      [650, 460],
      [120, 420],
    ];
    const h = solveHomography(square, quad);
    square.forEach((p, k) => {
      const q = applyHomography(h, p);
      expect(q[0]).toBeCloseTo(quad[k]![0], 9);
      expect(q[1]).toBeCloseTo(quad[k]![1], 9);
    });
    // The midpoint of the top edge in chart terms lies on the image's top edge (a perspective keeps lines).
    const m = applyHomography(h, [0.5, 0]);
    const cross = (700 - 100) * (m[1] - 50) - (80 - 50) * (m[0] - 100);
    expect(cross).toBeCloseTo(0, 6);
    // …but not at the segment's midpoint, since the far side is foreshortened.
    expect(Math.abs(m[0] - 400)).toBeGreaterThan(1);
  });

  it('refuses three corners in a line, with a message of the usual shape', () => {
    expect(() =>
      solveHomography(square, [
        [0, 0],
        [1, 1],
        [2, 2],
        [0, 5],
      ]),
    ).toThrow('Expected four points with no three in line but received a degenerate quadrilateral');
    expect(() => solveHomography(square.slice(0, 3), square)).toThrow(
      'Expected 4 source and 4 destination points but received 3 and 4',
    );
  });
});
