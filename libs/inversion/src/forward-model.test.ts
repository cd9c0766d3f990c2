import { validateProfileDocument } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  DEMO_STOCKS,
  exposeNegative,
  filmDensity,
  greySteps,
  LINEAR_SCANNER,
  POLYCLEAR_200,
  profileForStock,
  relativeLogExposure,
  resolveInversion,
  type InversionParams,
} from './index';

describe('forward film model', () => {
  it('gives every invented stock a profile that passes the profile schema', () => {
    for (const stock of DEMO_STOCKS) expect(validateProfileDocument(profileForStock(stock)).ok).toBe(true);
  });
  it('follows a straight line of slope γ between toe and shoulder', () => {
    const slope = (filmDensity(POLYCLEAR_200, 1, -0.5) - filmDensity(POLYCLEAR_200, 1, -1)) / 0.5;
    expect(slope).toBeCloseTo(POLYCLEAR_200.gamma[1], 2);
  });
  it('punches clipped sprocket holes into the rebate and leaves the rebate at base + fog', () => {
    const neg = exposeNegative(greySteps(4, 0.05, 0.8, 40), {
      stock: POLYCLEAR_200,
      scanner: LINEAR_SCANNER,
      rebate: 12,
      sprocketHoles: true,
    });
    const px = (x: number, y: number) => neg.data[(y * neg.width + x) * 3]!;
    expect(px(8, 5)).toBe(65535);
    expect(px(1, 1) / 65535).toBeCloseTo(neg.truth.base[0], 4);
  });
  it('makes the same grain from the same seed and different grain from another', () => {
    const scene = greySteps(2, 0.18, 0.18, 16);
    const a = exposeNegative(scene, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER, grain: 0.02, seed: 3 });
    const b = exposeNegative(scene, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER, grain: 0.02, seed: 3 });
    const c = exposeNegative(scene, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER, grain: 0.02, seed: 4 });
    expect(a.data).toEqual(b.data);
    expect(a.data).not.toEqual(c.data);
  });
  it('moves the recovered red log exposure by 0.30 for 12 printer points of cyan–red balance (common practice of the trade, from memory)', () => {
    const neg = exposeNegative(greySteps(1, 0.18, 0.18, 1), {
      stock: POLYCLEAR_200,
      scanner: LINEAR_SCANNER,
    });
    const counts = [neg.data[0]!, neg.data[1]!, neg.data[2]!] as [number, number, number];
    const params: InversionParams = {
      profile: profileForStock(POLYCLEAR_200),
      scanner: LINEAR_SCANNER,
      base: neg.truth.base,
      midLogExposure: 0,
      render: 'reference',
      outputBits: 16,
    };
    const plain = relativeLogExposure(resolveInversion(params), params, counts);
    const withPoints = { ...params, balances: [{ cyanRed: 12, magentaGreen: 0, yellowBlue: 0 }] };
    const shifted = relativeLogExposure(resolveInversion(withPoints), withPoints, counts);
    expect(shifted[0] - plain[0]).toBeCloseTo(0.3, 10);
    expect(shifted[1] - plain[1]).toBeCloseTo(0, 10);
  });
});
