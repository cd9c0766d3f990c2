import { describe, expect, it } from 'vitest';
import { balanceSchema } from '../profiles/profile-document';
import { adjustmentsSchema, isSixthOfStop, readStoredAdjustments } from './roll';

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

describe('printer points and exposure steps of a roll or a frame', () => {
  it('refuses a cast that is not whole printer points, at the axis', () => {
    const res = adjustmentsSchema.safeParse({ balance: { cyanRed: 1, magentaGreen: 2.5, yellowBlue: 0 } });
    expect(res.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['balance.magentaGreen', 'Use whole printer points'],
    ]);
    expect(
      adjustmentsSchema.parse({ balance: { cyanRed: -12, magentaGreen: 3, yellowBlue: 0 } }).balance,
    ).toEqual({
      cyanRed: -12,
      magentaGreen: 3,
      yellowBlue: 0,
    });
  });

  it('refuses an exposure that is not a whole number of 1/6 stops', () => {
    const res = adjustmentsSchema.safeParse({ exposureStops: 0.4 });
    expect(res.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['exposureStops', 'Use steps of 1/6 stop'],
    ]);
    expect(adjustmentsSchema.parse({ exposureStops: -7 / 6 }).exposureStops).toBe(-7 / 6);
  });

  it('leaves a profile document’s own balance free to be fractional', () => {
    expect(balanceSchema.parse({ cyanRed: 0.4, magentaGreen: -1.25, yellowBlue: 2.2 }).magentaGreen).toBe(
      -1.25,
    );
  });
});

describe('stored adjustments', () => {
  it('read back with no point shift when saved before the shifts existed', () => {
    const saved =
      '{"balance":{"cyanRed":2,"magentaGreen":0,"yellowBlue":-1},"exposureStops":0.5,"contrast":1.1}';
    expect(readStoredAdjustments(saved)).toEqual({
      balance: { cyanRed: 2, magentaGreen: 0, yellowBlue: -1 },
      exposureStops: 0.5,
      contrast: 1.1,
      blackPointStops: 0,
      whitePointStops: 0,
    });
    expect(
      readStoredAdjustments(JSON.stringify({ ...readStoredAdjustments(saved), whitePointStops: 1 }))
        .whitePointStops,
    ).toBe(1);
  });
});
