import { correctedExposureSeconds, reciprocityThresholdSeconds } from './corrected-exposure-seconds';

describe('correctedExposureSeconds', () => {
  it('raises a metered time to the power p: 10 s at p = 1.3 gives 19.95 s', () => {
    // 10^1.3 = 19.9526…; t_c = t_m^p, p ≈ 1.3: Schwarzschild's law in its practical form, common practice of the trade
    expect(correctedExposureSeconds(10, 1.3)).toBeCloseTo(19.9526, 4);
  });

  it('gives 14.9 s for 8 s metered at p = 1.3', () => {
    // worked example beside the practical form of Schwarzschild's law (common practice of the trade): 8 s ⇒ 14.9 s
    expect(correctedExposureSeconds(8, 1.3)).toBeCloseTo(14.93, 2);
  });

  it('applies no correction at or below one second', () => {
    expect(reciprocityThresholdSeconds).toBe(1);
    expect(correctedExposureSeconds(1, 1.3)).toBe(1);
    expect(correctedExposureSeconds(0.25, 1.5)).toBe(0.25);
  });

  it('leaves a time unchanged when p is 1', () => {
    expect(correctedExposureSeconds(30, 1)).toBe(30);
  });

  it('refuses a time that is not positive and an exponent below 1, saying what it received', () => {
    expect(() => correctedExposureSeconds(0, 1.3)).toThrow(
      'Expected a positive number of seconds for meteredSeconds but received 0 of type number',
    );
    expect(() => correctedExposureSeconds(Number.NaN, 1.3)).toThrow(RangeError);
    expect(() => correctedExposureSeconds(10, 0.8)).toThrow(
      'Expected a number of 1 or more for exponent but received 0.8 of type number',
    );
  });
});
