import { describe, expect, it } from 'vitest';
import { levelsToTone, neutralBalance, POLYCLEAR_200, profileForStock } from '@clearbase/inversion';
import { meteredLevels } from './metered-levels';

const profile = profileForStock(POLYCLEAR_200);

describe('metered levels', () => {
  it('put mid grey at the metered exposure, a stop less for a roll rated a stop faster', () => {
    expect(meteredLevels(profile, profile.stock.iso).midLogExposure).toBeCloseTo(Math.log10(0.18), 12);
    expect(
      meteredLevels(profile, profile.stock.iso * 2).midLogExposure -
        meteredLevels(profile, profile.stock.iso).midLogExposure,
    ).toBeCloseTo(-Math.log10(2), 12);
  });

  it('give back the profile’s own tone and no grey-world balance', () => {
    const levels = meteredLevels(profile, 400);
    const tone = levelsToTone(levels, profile.tone.contrast);
    expect(tone.blackPoint).toBeCloseTo(Math.max(1e-4, profile.tone.blackPoint), 9);
    expect(tone.whitePoint).toBeCloseTo(profile.tone.whitePoint, 9);
    expect(neutralBalance(levels)).toEqual({ cyanRed: 0, magentaGreen: 0, yellowBlue: 0 });
  });
});
