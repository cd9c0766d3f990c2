// The demo calibration roll's frame geometry, with no imports so browser tests can read it as well as the seed.

/** Size of the demo roll's frames and their parts, pixels. */
export const demoCalibrationFrame = {
  // 600 × 400 frames: small, so the seed takes a moment only and the chart's corners are still easy to click (our choice)
  width: 600,
  height: 400,
  // 40-pixel rebates, about a tenth of the height as on 35 mm film (common practice of the trade, from memory)
  rebate: 40,
  // 6 × 4 patches of 80 pixels: the chart fills the frame's height between the rebates (our choice)
  patchSize: 80,
} as const;

const { width, height, rebate, patchSize } = demoCalibrationFrame;
const greyHeight = height - 2 * rebate;
const chartWidth = 6 * patchSize;
const chartHeight = 4 * patchSize;

/** Where things are on the demo roll: the grey rectangle (the grey card's central half) and the chart's corners. */
export const demoCalibrationLayout = {
  /** [x, y, width, height] on every grey frame. */
  greyRegion: [
    Math.round(width / 4),
    rebate + Math.round(greyHeight / 4),
    width - 2 * Math.round(width / 4),
    greyHeight - 2 * Math.round(greyHeight / 4),
  ] as [number, number, number, number],
  /** Patch 1, 6, 24, 19 corners of the chart, pixels of the chart frame. */
  chartCorners: [
    [0, rebate],
    [chartWidth, rebate],
    [chartWidth, rebate + chartHeight],
    [0, rebate + chartHeight],
  ] as [number, number][],
  chart: { width: chartWidth, height: chartHeight + 2 * rebate },
  grey: { width, height },
};
