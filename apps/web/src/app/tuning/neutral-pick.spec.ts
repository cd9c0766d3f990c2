import type { Adjustments } from '@clearbase/contracts';
import {
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  measureFrameLevels,
  pickNeutral,
  POLYCLEAR_200,
  profileForStock,
} from '@clearbase/inversion';
import { describe, expect, it } from 'vitest';
import { negativeRegion, withCorrection } from './neutral-pick';
import { previewParams } from './tuning-preview';

const zero: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

describe('neutral picker on the tuning screen', () => {
  it('maps a drag on the shown image to the negative’s pixels, a click to a small area inside it', () => {
    const shown = { width: 750, height: 500 };
    const negative = { width: 1500, height: 1000 };
    expect(negativeRegion({ x0: 20, y0: 20, x1: 10, y1: 10 }, shown, negative)).toEqual([20, 20, 20, 20]);
    expect(negativeRegion({ x0: 749.8, y0: 499.9, x1: 749.8, y1: 499.9 }, shown, negative)).toEqual([
      1497, 997, 3, 3,
    ]);
  });

  it('takes a known magenta cast out of a grey card in whole points, at the roll’s and the frame’s adjustments', () => {
    const profile = profileForStock(POLYCLEAR_200);
    const negative = exposeNegative(greySteps(1, 0.18, 0.18, 48), {
      stock: POLYCLEAR_200,
      scanner: LINEAR_SCANNER,
      rebate: 6,
    });
    const base = negative.truth.base;
    const levels = measureFrameLevels(
      { profile, scanner: LINEAR_SCANNER, base, render: 'print', outputBits: 8 },
      negative,
    );
    // the roll carries a magenta cast of 8 points; the card should come back grey
    const roll: Adjustments = { ...zero, balance: { cyanRed: 0, magentaGreen: -8, yellowBlue: 0 } };
    const before = pickNeutral(
      negative,
      negative.truth.frame,
      previewParams(profile, LINEAR_SCANNER, base, levels, zero, zero),
    );
    const pick = pickNeutral(
      negative,
      negative.truth.frame,
      previewParams(profile, LINEAR_SCANNER, base, levels, roll, zero),
    );
    // against red, green lifts by the 8 points the cast took, within half a point
    const lift =
      pick.correction.magentaGreen -
      pick.correction.cyanRed -
      (before.correction.magentaGreen - before.correction.cyanRed);
    expect(Math.abs(lift - 8)).toBeLessThanOrEqual(0.5);
    const frame = withCorrection(zero, pick.correction);
    const after = pickNeutral(
      negative,
      negative.truth.frame,
      previewParams(profile, LINEAR_SCANNER, base, levels, roll, frame),
    );
    for (const axis of ['cyanRed', 'magentaGreen', 'yellowBlue'] as const) {
      expect(Number.isInteger(frame.balance[axis])).toBe(true);
      expect(Math.abs(after.correction[axis])).toBeLessThanOrEqual(0.5);
    }
  });
});
