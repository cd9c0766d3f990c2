import { Matrix, solve } from 'ml-matrix';
import type { Matrix3 } from '../srgb';

/** A point in pixels (or any plane coordinates): x, y. */
export type Point = [x: number, y: number];

/**
 * The perspective transform (homography) taking four source points onto four destination points, as a
 * row-major 3×3 matrix with its last element 1. Solved as the 8×8 linear system of the direct linear
 * transform (two equations per correspondence). Throws a RangeError when three of the points are in line.
 * @example solveHomography([[0, 0], [1, 0], [1, 1], [0, 1]], [[10, 10], [20, 10], [20, 20], [10, 20]]) // [[10, 0, 10], [0, 10, 10], [0, 0, 1]]
 */
export function solveHomography(source: readonly Point[], destination: readonly Point[]): Matrix3 {
  if (source.length !== 4 || destination.length !== 4)
    throw new RangeError(
      `Expected 4 source and 4 destination points but received ${source.length} and ${destination.length}`,
    );
  for (const p of [...source, ...destination])
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1]))
      throw new RangeError(`Expected finite coordinates but received ${JSON.stringify(p)}`);
  const rows: number[][] = [];
  const rhs: number[] = [];
  for (let k = 0; k < 4; k++) {
    const [u, v] = source[k]!;
    const [x, y] = destination[k]!;
    rows.push([u, v, 1, 0, 0, 0, -u * x, -v * x]);
    rhs.push(x);
    rows.push([0, 0, 0, u, v, 1, -u * y, -v * y]);
    rhs.push(y);
  }
  if (collinearTriple(source) || collinearTriple(destination))
    throw new RangeError(
      'Expected four points with no three in line but received a degenerate quadrilateral',
    );
  const h = solve(new Matrix(rows), Matrix.columnVector(rhs)).to1DArray();
  return [
    [h[0]!, h[1]!, h[2]!],
    [h[3]!, h[4]!, h[5]!],
    [h[6]!, h[7]!, 1],
  ];
}

/**
 * Maps a point through a homography (with the perspective division).
 * @example applyHomography([[2, 0, 1], [0, 2, 1], [0, 0, 1]], [1, 1]) // [3, 3]
 */
export function applyHomography(h: Matrix3, point: Point): Point {
  const [u, v] = point;
  const w = h[2][0] * u + h[2][1] * v + h[2][2];
  return [(h[0][0] * u + h[0][1] * v + h[0][2]) / w, (h[1][0] * u + h[1][1] * v + h[1][2]) / w];
}

// Twice the triangle's area, relative to its squared size, below which three points count as in line (from memory).
const COLLINEAR_TOLERANCE = 1e-9;

function collinearTriple(points: readonly Point[]): boolean {
  for (let a = 0; a < 4; a++)
    for (let b = a + 1; b < 4; b++)
      for (let c = b + 1; c < 4; c++) {
        const [p, q, r] = [points[a]!, points[b]!, points[c]!];
        const cross = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
        const size = Math.max(
          (q[0] - p[0]) ** 2 + (q[1] - p[1]) ** 2,
          (r[0] - p[0]) ** 2 + (r[1] - p[1]) ** 2,
        );
        if (Math.abs(cross) <= COLLINEAR_TOLERANCE * Math.max(size, 1e-300)) return true;
      }
  return false;
}
