import { describe, expect, it } from 'vitest';
import { adjustmentsSchema } from '../orders/roll';
import { frameReviewRequestSchema, sumAdjustments } from './tuning';

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
    const sum = sumAdjustments(profile, saved as never, saved as never);
    expect(sum.blackPointStops).toBe(0);
    expect(sum.whitePointStops).toBe(0);
  });

  it('takes the frame’s contrast over the roll’s, and the roll’s over the profile’s', () => {
    const roll = adjustmentsSchema.parse({ contrast: 1.3 });
    expect(sumAdjustments(profile, roll, adjustmentsSchema.parse({})).contrast).toBe(1.3);
    expect(sumAdjustments(profile, roll, adjustmentsSchema.parse({ contrast: 0.9 })).contrast).toBe(0.9);
  });
});

describe('frame review', () => {
  it('asks a rejection to say why, at the note', () => {
    const res = frameReviewRequestSchema.safeParse({ decision: 'rejected', note: '  ' });
    expect(res.success).toBe(false);
    expect(res.error?.issues[0]?.path).toEqual(['note']);
    expect(frameReviewRequestSchema.parse({ decision: 'approved' })).toEqual({
      decision: 'approved',
      note: '',
    });
  });
});
