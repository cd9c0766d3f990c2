import { describe, expect, it } from 'vitest';
import { actualPixelsPlacement, clampOffset, spotUnder } from './actual-pixels';

describe('actual pixels', () => {
  it('finds the spot of the frame under the pointer, and the centre outside the frame', () => {
    const drawn = { left: 100, top: 20, width: 200, height: 100 };
    expect(spotUnder({ x: 150, y: 70 }, drawn)).toEqual({ fx: 0.25, fy: 0.5 });
    expect(spotUnder({ x: 300, y: 120 }, drawn)).toEqual({ fx: 1, fy: 1 });
    expect(spotUnder({ x: 99, y: 70 }, drawn)).toEqual({ fx: 0.5, fy: 0.5 });
    expect(spotUnder(null, drawn)).toEqual({ fx: 0.5, fy: 0.5 });
    expect(spotUnder({ x: 0, y: 0 }, { left: 0, top: 0, width: 0, height: 0 })).toEqual({ fx: 0.5, fy: 0.5 });
  });

  it('puts the spot under the pointer at one image pixel per screen pixel', () => {
    const placed = actualPixelsPlacement(
      { fx: 0.5, fy: 0.25 },
      { x: 300, y: 200 },
      { x: 6000, y: 4000 },
      { x: 800, y: 600 },
      1,
    );
    expect(placed.size).toEqual({ x: 6000, y: 4000 });
    // image pixel (3000, 1000) sits at the pointer
    expect(placed.offset).toEqual({ x: 300 - 3000, y: 200 - 1000 });
  });

  it('draws the image smaller in CSS pixels on a screen of two device pixels per CSS pixel', () => {
    const placed = actualPixelsPlacement(
      { fx: 0.5, fy: 0.5 },
      { x: 400, y: 300 },
      { x: 6000, y: 4000 },
      { x: 800, y: 600 },
      2,
    );
    expect(placed.size).toEqual({ x: 3000, y: 2000 });
    expect(placed.offset).toEqual({ x: 400 - 1500, y: 300 - 1000 });
  });

  it('shows no empty space beside a large image, and centres a small one', () => {
    expect(clampOffset({ x: 50, y: -10 }, { x: 1000, y: 200 }, { x: 400, y: 300 })).toEqual({ x: 0, y: 50 });
    expect(clampOffset({ x: -900, y: 0 }, { x: 1000, y: 200 }, { x: 400, y: 300 })).toEqual({
      x: -600,
      y: 50,
    });
    // the corner of a large image stays at the viewport's corner when the spot is the image's own corner
    const corner = actualPixelsPlacement(
      { fx: 0, fy: 0 },
      { x: 400, y: 300 },
      { x: 6000, y: 4000 },
      { x: 800, y: 600 },
      1,
    );
    expect(corner.offset).toEqual({ x: 0, y: 0 });
  });
});
