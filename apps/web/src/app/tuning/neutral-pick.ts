import type { Adjustments, Balance } from '@clearbase/contracts';
import type { Region } from '@clearbase/inversion';

/** A rectangle dragged on the viewer, in the displayed image's pixels (any corner first). */
export interface DraggedRectangle {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/**
 * The negative's pixels under a rectangle dragged on the displayed image: scaled to the negative, at least 3×3 so a
 * click picks a small area, kept inside the negative.
 * @example negativeRegion({ x0: 10, y0: 10, x1: 20, y1: 20 }, { width: 750, height: 500 }, { width: 1500, height: 1000 }) // [20, 20, 20, 20]
 */
export function negativeRegion(
  drag: DraggedRectangle,
  shown: { width: number; height: number },
  negative: { width: number; height: number },
): Region {
  const sx = negative.width / shown.width;
  const sy = negative.height / shown.height;
  // a click alone stands for a 3×3 area: small enough to hit one patch, large enough to average the grain (our choice)
  const least = 3;
  let x = Math.floor(Math.min(drag.x0, drag.x1) * sx);
  let y = Math.floor(Math.min(drag.y0, drag.y1) * sy);
  let w = Math.max(least, Math.round(Math.abs(drag.x1 - drag.x0) * sx));
  let h = Math.max(least, Math.round(Math.abs(drag.y1 - drag.y0) * sy));
  x = Math.max(0, Math.min(x, negative.width - least));
  y = Math.max(0, Math.min(y, negative.height - least));
  w = Math.min(w, negative.width - x);
  h = Math.min(h, negative.height - y);
  return [x, y, w, h];
}

/**
 * Adds the picker's correction to adjustments in whole printer points, as the controls step.
 * @example withCorrection(frame, { cyanRed: 0.4, magentaGreen: 7.8, yellowBlue: -0.2 }).balance // { cyanRed: 0, magentaGreen: 8, yellowBlue: 0 } over a zero balance
 */
export function withCorrection(adjustments: Adjustments, correction: Balance): Adjustments {
  const whole = (v: number) => Math.round(v) + 0;
  return {
    ...adjustments,
    balance: {
      cyanRed: whole(adjustments.balance.cyanRed + correction.cyanRed),
      magentaGreen: whole(adjustments.balance.magentaGreen + correction.magentaGreen),
      yellowBlue: whole(adjustments.balance.yellowBlue + correction.yellowBlue),
    },
  };
}
