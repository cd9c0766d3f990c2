import { adjustmentsSchema } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  levelsToTone,
  measureFrameLevels,
  neutralBalance,
  POLYCLEAR_200,
  profileForStock,
  shiftLevelPoints,
} from './index';
import { frameRenderParams, sumAdjustments, summedTone } from './sum-adjustments';

const profile = {
  balance: { cyanRed: 1, magentaGreen: -2, yellowBlue: 3 },
  tone: { contrast: 1.1, blackPoint: 0, whitePoint: 1 },
};

describe('adjustments of a frame', () => {
  it('add up: profile + roll + frame points, roll + frame stops', () => {
    const roll = adjustmentsSchema.parse({
      balance: { cyanRed: 2, magentaGreen: 4, yellowBlue: -1 },
      exposureStops: 0.5,
    });
    const frame = adjustmentsSchema.parse({
      balance: { cyanRed: -1, magentaGreen: 3, yellowBlue: 0 },
      exposureStops: -1 / 6,
    });
    const sum = sumAdjustments(profile, roll, frame);
    expect(sum.balance).toEqual({ cyanRed: 2, magentaGreen: 5, yellowBlue: 2 });
    expect(sum.exposureStops).toBeCloseTo(1 / 3, 12);
    expect(sum.contrast).toBe(1.1);
  });

  it('add the roll’s and the frame’s black and white point shifts', () => {
    const roll = adjustmentsSchema.parse({ blackPointStops: 0.5, whitePointStops: -1 / 3 });
    const frame = adjustmentsSchema.parse({ blackPointStops: 1 / 6, whitePointStops: 1 });
    const sum = sumAdjustments(profile, roll, frame);
    expect(sum.blackPointStops).toBeCloseTo(2 / 3, 12);
    expect(sum.whitePointStops).toBeCloseTo(2 / 3, 12);
  });

  it('reads adjustments saved before the point shifts existed as no shift', () => {
    const saved = {
      balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
      exposureStops: 0,
      contrast: null,
    };
    const sum = sumAdjustments(profile, saved, saved);
    expect(sum.blackPointStops).toBe(0);
    expect(sum.whitePointStops).toBe(0);
  });

  it('takes the frame’s contrast over the roll’s, and the roll’s over the profile’s', () => {
    const roll = adjustmentsSchema.parse({ contrast: 1.3 });
    expect(sumAdjustments(profile, roll, adjustmentsSchema.parse({})).contrast).toBe(1.3);
    expect(sumAdjustments(profile, roll, adjustmentsSchema.parse({ contrast: 0.9 })).contrast).toBe(0.9);
  });
});

describe('a frame’s render parameters', () => {
  const stock = profileForStock(POLYCLEAR_200);
  const negative = exposeNegative(greySteps(6, 0.03, 0.9, 12), {
    stock: POLYCLEAR_200,
    scanner: LINEAR_SCANNER,
  });
  const base = negative.truth.base;
  const levels = measureFrameLevels(
    { profile: stock, scanner: LINEAR_SCANNER, base, render: 'print', outputBits: 8 },
    negative,
  );
  const roll = adjustmentsSchema.parse({
    balance: { cyanRed: 2, magentaGreen: 0, yellowBlue: 0 },
    blackPointStops: 0.5,
  });
  const frame = adjustmentsSchema.parse({ exposureStops: 1 / 3, contrast: 1.2, whitePointStops: -1 / 6 });

  it('carry the summed balance and exposure, the levels’ grey balance and E_mid', () => {
    const params = frameRenderParams({
      profile: stock,
      scanner: LINEAR_SCANNER,
      base,
      levels,
      roll,
      frame,
      outputBits: 16,
    });
    expect(params.profile.balance.cyanRed).toBeCloseTo(stock.balance.cyanRed + 2, 12);
    expect(params.balances).toEqual([neutralBalance(levels)]);
    expect(params.exposureStops).toBeCloseTo(1 / 3, 12);
    expect(params.midLogExposure).toBe(levels.midLogExposure);
    expect(params.render).toBe('print');
  });

  it('print through the tone of the shifted points at the contrast in force', () => {
    const params = frameRenderParams({
      profile: stock,
      scanner: LINEAR_SCANNER,
      base,
      levels,
      roll,
      frame,
      outputBits: 8,
    });
    const expected = levelsToTone(shiftLevelPoints(levels, 0.5, -1 / 6), 1.2);
    expect(params.profile.tone).toEqual(expected);
    expect(summedTone(levels, sumAdjustments(stock, roll, frame))).toEqual(expected);
    expect(params.profile.tone.blackPoint).toBeGreaterThan(levelsToTone(levels, 1.2).blackPoint);
  });
});
