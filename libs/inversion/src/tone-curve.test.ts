import { describe, expect, it } from 'vitest';
import {
  applyInversion,
  compileInversion,
  LINEAR_SCANNER,
  POLYCLEAR_200,
  profileForStock,
  referenceTone,
  resolveInversion,
  toneCurve,
  type InversionParams,
} from './index';

describe('tone curves', () => {
  it('keeps 18 % grey at 18 % in the reference rendering and with a neutral print curve', () => {
    expect(referenceTone(0)).toBeCloseTo(0.18, 12);
    expect(toneCurve(0, { contrast: 1.4, blackPoint: 0, whitePoint: 1 })).toBeCloseTo(0.18, 12);
  });
  it('maps the black point to 0 and the white point to 1, clipping beyond', () => {
    const tone = { contrast: 1, blackPoint: 0.01, whitePoint: 0.9 };
    expect(toneCurve(Math.log10(0.01 / 0.18), tone)).toBeCloseTo(0, 12);
    expect(toneCurve(Math.log10(0.9 / 0.18), tone)).toBeCloseTo(1, 12);
    expect(toneCurve(2, tone)).toBe(1);
    expect(toneCurve(-5, tone)).toBe(0);
  });
  it('steepens with contrast: one stop brighter gains more above mid grey', () => {
    const t = (contrast: number) => toneCurve(Math.log10(2), { contrast, blackPoint: 0, whitePoint: 1 });
    expect(t(1.3)).toBeGreaterThan(t(1));
  });
});

describe('parameter checks', () => {
  const params: InversionParams = {
    profile: profileForStock(POLYCLEAR_200),
    scanner: LINEAR_SCANNER,
    base: [0.8, 0.8, 0.8],
    midLogExposure: -0.7,
    render: 'print',
    outputBits: 8,
  };
  it('refuses a base of zero and an unknown output depth with messages of one shape', () => {
    expect(() => resolveInversion({ ...params, base: [0.8, 0, 0.8] })).toThrow(
      'Expected number above 0 and at most 1 for base[1] but received 0 of type number',
    );
    expect(() => compileInversion({ ...params, outputBits: 12 as 8 })).toThrow(
      'Expected 8 or 16 for outputBits but received 12 of type number',
    );
  });
  it('refuses a pixel range past the input and an output of the wrong depth', () => {
    const plan = compileInversion(params);
    const input = new Uint16Array(30);
    expect(() => applyInversion(plan, input, new Uint8Array(30), 8, 3)).toThrow(
      'Expected integer between 0 and 2 for pixelCount but received 3 of type number',
    );
    expect(() => applyInversion(plan, input, new Uint16Array(30), 0, 10)).toThrow(
      'Expected Uint8Array for output of a 8-bit plan but received Uint16Array',
    );
  });
});
