import type { Balance } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  addBalances,
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  LUMINANCE_WEIGHTS,
  pickNeutral,
  POLYCLEAR_200,
  profileForStock,
  TINTLINE_400,
  type InversionParams,
} from './index';

const axes = ['cyanRed', 'magentaGreen', 'yellowBlue'] as const;

function greyNegative(stock = POLYCLEAR_200) {
  // a flat 18 % grey card, common practice of the trade for neutral balance
  return exposeNegative(greySteps(1, 0.18, 0.18, 64), { stock, scanner: LINEAR_SCANNER, rebate: 8 });
}

function paramsFor(
  neg: ReturnType<typeof greyNegative>,
  stock = POLYCLEAR_200,
  cast?: Balance,
): InversionParams {
  return {
    profile: profileForStock(stock),
    scanner: LINEAR_SCANNER,
    base: neg.truth.base,
    midLogExposure: neg.truth.midLogExposure,
    render: 'print',
    outputBits: 8,
    ...(cast ? { balances: [cast] } : {}),
  };
}

/** The correction that undoes `cast` at unchanged luminance: −cast plus the cast's luminance-weighted mean. */
function expectedCorrection(cast: Balance): Balance {
  const lift = axes.reduce((s, a, c) => s + LUMINANCE_WEIGHTS[c]! * cast[a], 0);
  return {
    cyanRed: lift - cast.cyanRed,
    magentaGreen: lift - cast.magentaGreen,
    yellowBlue: lift - cast.yellowBlue,
  };
}

describe('neutral picker', () => {
  it('finds no correction on a grey card rendered through its own stock profile', () => {
    const neg = greyNegative();
    const pick = pickNeutral(neg, neg.truth.frame, paramsFor(neg));
    for (const a of axes) expect(Math.abs(pick.correction[a])).toBeLessThan(0.5);
  });

  it('gives back a known magenta cast of 8 points, within half a point', () => {
    const neg = greyNegative();
    const cast = { cyanRed: 0, magentaGreen: -8, yellowBlue: 0 };
    const base = pickNeutral(neg, neg.truth.frame, paramsFor(neg)).correction;
    const pick = pickNeutral(neg, neg.truth.frame, paramsFor(neg, POLYCLEAR_200, cast));
    const expected = addBalances(base, expectedCorrection(cast));
    for (const a of axes) expect(Math.abs(pick.correction[a] - expected[a])).toBeLessThanOrEqual(0.5);
    // against red, green is lifted by the 8 points the cast took away
    expect(pick.correction.magentaGreen - pick.correction.cyanRed).toBeCloseTo(8, 0);
  });

  it('gives back a cast on all three axes on another stock, within half a point', () => {
    const neg = greyNegative(TINTLINE_400);
    const cast = { cyanRed: 5, magentaGreen: -3, yellowBlue: 11 };
    const base = pickNeutral(neg, neg.truth.frame, paramsFor(neg, TINTLINE_400)).correction;
    const pick = pickNeutral(neg, neg.truth.frame, paramsFor(neg, TINTLINE_400, cast));
    const expected = addBalances(base, expectedCorrection(cast));
    for (const a of axes) expect(Math.abs(pick.correction[a] - expected[a])).toBeLessThanOrEqual(0.5);
  });

  it('renders the area neutral once its correction is added', () => {
    const neg = greyNegative();
    const cast = { cyanRed: -4, magentaGreen: 7, yellowBlue: 2 };
    const first = pickNeutral(neg, neg.truth.frame, paramsFor(neg, POLYCLEAR_200, cast));
    const again = pickNeutral(
      neg,
      neg.truth.frame,
      paramsFor(neg, POLYCLEAR_200, addBalances(cast, first.correction)),
    );
    for (const a of axes) expect(Math.abs(again.correction[a])).toBeLessThan(1e-6);
    const [r, g, b] = again.meanLogExposure;
    expect(Math.abs(r - g) + Math.abs(g - b)).toBeLessThan(1e-6);
  });

  it('refuses an area outside the negative', () => {
    const neg = greyNegative();
    expect(() => pickNeutral(neg, [neg.width + 5, 0, 10, 10], paramsFor(neg))).toThrow(RangeError);
  });
});
