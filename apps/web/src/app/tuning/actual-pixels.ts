/** A point or a size on the screen, in CSS pixels. */
export interface ScreenPoint {
  x: number;
  y: number;
}

/** Where a spot of the frame is, as fractions of its width and height (0 = left or top, 1 = right or bottom). */
export interface FrameSpot {
  fx: number;
  fy: number;
}

/**
 * The spot of the frame under a screen point, from the rectangle the frame is drawn in; the centre when the point is
 * outside it or the frame is not drawn yet.
 * @example spotUnder({ x: 150, y: 50 }, { left: 100, top: 0, width: 200, height: 100 }) // { fx: 0.25, fy: 0.5 }
 */
export function spotUnder(
  point: ScreenPoint | null,
  drawn: { left: number; top: number; width: number; height: number } | null,
): FrameSpot {
  if (!point || !drawn || drawn.width <= 0 || drawn.height <= 0) return { fx: 0.5, fy: 0.5 };
  const fx = (point.x - drawn.left) / drawn.width;
  const fy = (point.y - drawn.top) / drawn.height;
  return fx < 0 || fx > 1 || fy < 0 || fy > 1 ? { fx: 0.5, fy: 0.5 } : { fx, fy };
}

/**
 * Keeps an image of `size` inside a viewport of `viewport` as far as it can: an image wider than the viewport never
 * shows empty space at a side, a narrower one sits in the middle (each axis on its own).
 * @example clampOffset({ x: 50, y: -10 }, { x: 1000, y: 200 }, { x: 400, y: 300 }) // { x: 0, y: 50 }
 */
export function clampOffset(offset: ScreenPoint, size: ScreenPoint, viewport: ScreenPoint): ScreenPoint {
  const axis = (at: number, image: number, room: number) =>
    image <= room ? (room - image) / 2 : Math.min(0, Math.max(room - image, at));
  return { x: axis(offset.x, size.x, viewport.x), y: axis(offset.y, size.y, viewport.y) };
}

/**
 * Where to put the top-left corner of a full-size image shown one screen pixel to one image pixel, so that `spot`
 * lands on `anchor` (the pointer, or the viewport's centre), kept inside the viewport.
 * `pixels` is the image's size in image pixels and `devicePixelRatio` the screen pixels per CSS pixel: the image is
 * drawn `pixels / devicePixelRatio` CSS pixels wide, which is one image pixel per screen pixel.
 * @example actualPixelsPlacement({ fx: 0.5, fy: 0.5 }, { x: 400, y: 300 }, { x: 6000, y: 4000 }, { x: 800, y: 600 }, 1)
 * // { size: { x: 6000, y: 4000 }, offset: { x: -2600, y: -1700 } }
 */
export function actualPixelsPlacement(
  spot: FrameSpot,
  anchor: ScreenPoint,
  pixels: ScreenPoint,
  viewport: ScreenPoint,
  devicePixelRatio: number,
): { size: ScreenPoint; offset: ScreenPoint } {
  const ratio = devicePixelRatio > 0 ? devicePixelRatio : 1;
  const size = { x: pixels.x / ratio, y: pixels.y / ratio };
  const offset = clampOffset(
    { x: anchor.x - spot.fx * size.x, y: anchor.y - spot.fy * size.y },
    size,
    viewport,
  );
  return { size, offset };
}
