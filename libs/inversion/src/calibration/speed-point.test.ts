import { describe, expect, it } from 'vitest';
import { createMonotoneCurve } from '../monotone-curve';
import { NOMINAL_SPEED_POINT_DEPTH, speedPoint } from './speed-point';

// Straight curves reaching 0.15 above base at the given relative log exposure, slope 0.6.
const through = (x015: number) => createMonotoneCurve([x015 - 1, x015 + 2], [0.15 - 0.6, 0.15 + 1.2]);

describe('speed point', () => {
  // ISO 5800:1987: each layer's point 0.15 above minimum density; H_M = √(H_G · H_S), H_S the slower of red and blue.
  it('combines green with the slower of red and blue as ISO 5800 does, and rates EI = ISO × 2^−offset', () => {
    const sp = speedPoint([through(-1.1), through(-1.2), through(-1.15)], 200);
    expect(sp.channels.map((v) => Number(v.toFixed(9)))).toEqual([-1.1, -1.2, -1.15]);
    expect(sp.slowerLayer).toBe(0);
    expect(sp.logExposure).toBeCloseTo(-1.15, 9);
    // offset = (−1.15 + 0.7593) / 0.30103 = −1.298 stops; EI = 200 × 2^1.298 ≈ 492.
    expect(sp.offsetStops).toBeCloseTo((-1.15 + NOMINAL_SPEED_POINT_DEPTH) / Math.log10(2), 9);
    expect(sp.offsetStops).toBeCloseTo(-1.298, 3);
    expect(sp.ei).toBeCloseTo(492, 0);
  });

  it('rates a film at its box speed when the speed point sits 0.759 log E (about 2.5 stops) under the metered grey', () => {
    const x = -NOMINAL_SPEED_POINT_DEPTH;
    expect(NOMINAL_SPEED_POINT_DEPTH).toBeCloseTo(0.7593, 4);
    expect(speedPoint([through(x), through(x), through(x)], 400).ei).toBeCloseTo(400, 9);
  });

  it('says which layers were extrapolated below the lowest measured density', () => {
    const sp = speedPoint([through(-1), through(-1), through(-1)], 100, [0.1, 0.2, 0.1]);
    expect(sp.extrapolated).toEqual([false, true, false]);
  });

  it('refuses an ISO that is not a positive number', () => {
    expect(() => speedPoint([through(0), through(0), through(0)], 0)).toThrow(
      'Expected number above 0 for iso but received 0 of type number',
    );
  });
});
