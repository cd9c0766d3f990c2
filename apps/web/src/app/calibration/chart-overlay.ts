import type { FramePoint, PixelRegion } from '@clearbase/contracts';
import { chartGridFromCorners, type Point } from '@clearbase/inversion';

/** The four corners in the order the operator clicks them: by patch 1, 6, 24 and 19. */
export const cornerNames = [
  'patch 1 (dark skin)',
  'patch 6 (bluish green)',
  'patch 24 (black)',
  'patch 19 (white)',
] as const;

/** A drawn polygon: SVG `points` text in frame pixels. */
export interface OverlayPolygon {
  index: number;
  cell: string;
  sample: string;
}

/**
 * Where a click on the displayed preview lands on the full-size frame, in frame pixels: the preview is scaled to
 * `box` (its on-screen rectangle) and the frame is `frame` pixels, so x scales by frame.width / box.width. Clamped to
 * the frame.
 * @example clientToFrame({ x: 150, y: 60 }, { left: 100, top: 50, width: 200, height: 100 }, { width: 4000, height: 2000 }) // [1000, 200]
 */
export function clientToFrame(
  client: { x: number; y: number },
  box: { left: number; top: number; width: number; height: number },
  frame: { width: number; height: number },
): FramePoint {
  const x = ((client.x - box.left) / box.width) * frame.width;
  const y = ((client.y - box.top) / box.height) * frame.height;
  const clamp = (v: number, max: number) => Math.round(Math.min(max, Math.max(0, v)) * 10) / 10;
  return [clamp(x, frame.width), clamp(y, frame.height)];
}

const pointsText = (quad: readonly Point[]) =>
  quad.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(' ');

/**
 * The chart's 24 cells and their sampling areas, followed with perspective from its four corners, as SVG polygons in
 * frame pixels (the same grid the server samples). Empty until all four corners are set or when they make no
 * quadrilateral.
 */
export function chartOverlay(corners: readonly FramePoint[]): OverlayPolygon[] {
  if (corners.length !== 4) return [];
  try {
    return chartGridFromCorners(corners as Point[]).patches.map((p) => ({
      index: p.index,
      cell: pointsText(p.cell),
      sample: pointsText(p.sample),
    }));
  } catch {
    return [];
  }
}

/**
 * The rectangle between two dragged points, in whole frame pixels, at least 1 × 1 and inside the frame.
 * @example rectangleBetween([30, 40], [10, 10], { width: 100, height: 100 }) // { x: 10, y: 10, width: 20, height: 30 }
 */
export function rectangleBetween(
  a: FramePoint,
  b: FramePoint,
  frame: { width: number; height: number },
): PixelRegion {
  const x = Math.max(0, Math.floor(Math.min(a[0], b[0])));
  const y = Math.max(0, Math.floor(Math.min(a[1], b[1])));
  const right = Math.min(frame.width, Math.ceil(Math.max(a[0], b[0])));
  const bottom = Math.min(frame.height, Math.ceil(Math.max(a[1], b[1])));
  return {
    x: Math.min(x, frame.width - 1),
    y: Math.min(y, frame.height - 1),
    width: Math.max(1, right - x),
    height: Math.max(1, bottom - y),
  };
}

/**
 * The central half of a frame each way: the grey rectangle before the operator draws one (the command line's default).
 */
export function centralHalf(frame: { width: number; height: number }): PixelRegion {
  return {
    x: Math.floor(frame.width / 4),
    y: Math.floor(frame.height / 4),
    width: Math.max(1, Math.floor(frame.width / 2)),
    height: Math.max(1, Math.floor(frame.height / 2)),
  };
}
