import type { Region } from '../film-base';
import type { Matrix3 } from '../srgb';
import { applyHomography, solveHomography, type Point } from './homography';

/** A quadrilateral in pixels, corners in order around it. */
export type Quad = [Point, Point, Point, Point];

/** One patch of a chart grid, as polygons the UI can draw over the frame. */
export interface ChartGridPatch {
  /** 1-based, in row order: 1 … columns on the first row. */
  index: number;
  row: number;
  column: number;
  /** The whole cell, corners top-left, top-right, bottom-right, bottom-left in chart terms. */
  cell: Quad;
  /** The sampling area: the central `inner` fraction of the cell's width and height. */
  sample: Quad;
}

/** A chart's grid of patches and the transform from chart coordinates (column, row units) to pixels. */
export interface ChartGrid {
  rows: number;
  columns: number;
  /** Chart plane (u in 0…columns, v in 0…rows) → image pixels. */
  homography: Matrix3;
  patches: ChartGridPatch[];
}

/** Options of the chart grid. */
export interface ChartGridOptions {
  /** Rows of patches. Default 4 (the 24-patch chart). */
  rows?: number;
  /** Columns of patches. Default 6 (the 24-patch chart). */
  columns?: number;
  /**
   * Fraction of a cell's width and height that is sampled, centred. Default 0.5: the central half each way
   * (a quarter of the area) keeps clear of the gaps between patches and of edge blur (common practice, from memory).
   */
  inner?: number;
}

/**
 * The patch grid of a chart from its four outer corners, followed with perspective. Corners are given in
 * chart order — the corner by patch 1, by the last patch of the first row, by the last patch, by the first
 * patch of the last row — so a rotated or mirrored chart on the negative maps correctly.
 * Throws a RangeError for bad options or a degenerate quadrilateral.
 * @example chartGridFromCorners([[100, 50], [700, 60], [690, 460], [95, 450]]).patches[0].sample // 4 points inside patch 1
 */
export function chartGridFromCorners(corners: readonly Point[], options: ChartGridOptions = {}): ChartGrid {
  const rows = options.rows ?? 4;
  const columns = options.columns ?? 6;
  const inner = options.inner ?? 0.5;
  for (const [name, value, min, max] of [
    ['rows', rows, 1, 100],
    ['columns', columns, 1, 100],
  ] as const)
    if (!Number.isInteger(value) || value < min || value > max)
      throw new RangeError(
        `Expected integer between ${min} and ${max} for ${name} but received ${value} of type ${typeof value}`,
      );
  if (!(typeof inner === 'number' && inner > 0 && inner <= 1))
    throw new RangeError(
      `Expected number above 0 and at most 1 for inner but received ${inner} of type ${typeof inner}`,
    );
  const homography = solveHomography(
    [
      [0, 0],
      [columns, 0],
      [columns, rows],
      [0, rows],
    ],
    corners,
  );
  const quad = (u0: number, v0: number, u1: number, v1: number): Quad => [
    applyHomography(homography, [u0, v0]),
    applyHomography(homography, [u1, v0]),
    applyHomography(homography, [u1, v1]),
    applyHomography(homography, [u0, v1]),
  ];
  const margin = (1 - inner) / 2;
  const patches: ChartGridPatch[] = [];
  for (let row = 0; row < rows; row++)
    for (let column = 0; column < columns; column++)
      patches.push({
        index: row * columns + column + 1,
        row,
        column,
        cell: quad(column, row, column + 1, row + 1),
        sample: quad(column + margin, row + margin, column + 1 - margin, row + 1 - margin),
      });
  return { rows, columns, homography, patches };
}

/**
 * The patch grid of a chart that sits square in the frame, patch 1 at the top left of `region`.
 * @example chartGridFromRegion([0, 0, 600, 400]).patches[7].sample // [[125, 125], [175, 125], [175, 175], [125, 175]]
 */
export function chartGridFromRegion(region: Region, options: ChartGridOptions = {}): ChartGrid {
  const [x, y, w, h] = region;
  if (![x, y, w, h].every(Number.isFinite) || !(w > 0 && h > 0))
    throw new RangeError(
      `Expected x, y, width, height with width and height above 0 for region but received ${JSON.stringify(region)}`,
    );
  return chartGridFromCorners(
    [
      [x, y],
      [x + w, y],
      [x + w, y + h],
      [x, y + h],
    ],
    options,
  );
}
