import type { Rgb } from '../srgb';

/** One patch of the 24-patch chart's published reference. */
export interface ChartReferencePatch {
  /** 1 … 24 in row order, 6 patches a row, patch 1 (dark skin) at the top left. */
  index: number;
  name: string;
  /** CIE L*a*b* under D50 as published. */
  labD50: Rgb;
}

// The 24-patch colour rendition chart (McCamy, Marcus & Davidson, J. Appl. Photogr. Eng. 2(3):95-99, 1976):
// CIELAB D50 as published by the chart's maker for charts made after November 2014 (2016 specification).
const ROWS: [string, number, number, number][] = [
  ['dark skin', 37.54, 14.37, 14.92],
  ['light skin', 64.66, 19.27, 17.5],
  ['blue sky', 49.32, -3.82, -22.54],
  ['foliage', 43.46, -12.74, 22.72],
  ['blue flower', 54.94, 9.61, -24.79],
  ['bluish green', 70.48, -32.26, -0.37],
  ['orange', 62.73, 35.83, 56.5],
  ['purplish blue', 39.43, 10.75, -45.17],
  ['moderate red', 50.57, 48.64, 16.67],
  ['purple', 30.1, 22.54, -20.87],
  ['yellow green', 71.77, -24.13, 58.19],
  ['orange yellow', 71.51, 18.24, 67.37],
  ['blue', 28.37, 15.42, -49.8],
  ['green', 54.38, -39.72, 32.27],
  ['red', 42.43, 51.05, 28.62],
  ['yellow', 81.8, 2.67, 80.41],
  ['magenta', 50.63, 51.28, -14.12],
  ['cyan', 49.57, -29.71, -28.32],
  ['white 9.5', 95.19, -1.03, 2.93],
  ['neutral 8', 81.29, -0.57, 0.44],
  ['neutral 6.5', 66.89, -0.75, -0.06],
  ['neutral 5', 50.76, -0.13, 0.14],
  ['neutral 3.5', 35.63, -0.46, -0.48],
  ['black 2', 20.64, 0.07, -0.46],
];

/**
 * The 24-patch chart's published L*a*b* D50 values, the truth a calibration is measured against.
 * @example CHART_REFERENCE[18] // { index: 19, name: 'white 9.5', labD50: [95.19, -1.03, 2.93] }
 */
export const CHART_REFERENCE: readonly ChartReferencePatch[] = ROWS.map(([name, l, a, b], i) => ({
  index: i + 1,
  name,
  labD50: [l, a, b],
}));

/** Indices (1-based) of the chart's neutral row, white to black (the chart's bottom row). */
export const CHART_NEUTRAL_INDICES: readonly number[] = [19, 20, 21, 22, 23, 24];
