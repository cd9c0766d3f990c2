import { describe, expect, it } from 'vitest';
import { adjustmentsSchema, isSixthOfStop } from './roll';

describe('adjustments of a roll or a frame', () => {
  it('moves black and white points by up to 3 stops in steps of 1/6 stop', () => {
    expect(adjustmentsSchema.parse({ blackPointStops: -5 / 6, whitePointStops: 3 })).toMatchObject({
      blackPointStops: -5 / 6,
      whitePointStops: 3,
    });
    const off = adjustmentsSchema.safeParse({ blackPointStops: 0.1 });
    expect(off.error?.issues[0]).toMatchObject({
      path: ['blackPointStops'],
      message: 'Use steps of 1/6 stop',
    });
    const far = adjustmentsSchema.safeParse({ whitePointStops: 3.5 });
    expect(far.error?.issues[0]?.path).toEqual(['whitePointStops']);
  });

  it('takes sixths of a stop as JSON writes them', () => {
    expect(isSixthOfStop(JSON.parse(JSON.stringify(5 / 6)) as number)).toBe(true);
    expect(isSixthOfStop(0.16666666666666666)).toBe(true);
    expect(isSixthOfStop(0.17)).toBe(false);
  });
});
