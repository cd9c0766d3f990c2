import { validateProfileDocument } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  applyInversion,
  compileInversion,
  invertPixel,
  POLYCLEAR_200,
  profileForStock,
  WIDE_TO_LINEAR_SRGB,
  type InversionParams,
  type Matrix3,
} from './index';
import { gammaTestScanner, mixedTestImage, worstCodeDifference } from './test-fixtures';

// An exposure-space colour matrix as calibration fits one: rows summing to 1, mostly on the diagonal.
const FITTED: Matrix3 = [
  [1.21, -0.17, -0.04],
  [-0.09, 1.16, -0.07],
  [0.01, -0.2, 1.19],
];

const params = (profile: InversionParams['profile'], outputBits: 8 | 16 = 16): InversionParams => ({
  profile,
  scanner: gammaTestScanner,
  base: [0.82, 0.8, 0.78],
  midLogExposure: Math.log10(0.18) - 0.3,
  render: 'print',
  outputBits,
});

describe('the exposure-space colour matrix of a profile', () => {
  const doc = profileForStock(POLYCLEAR_200);
  const input = mixedTestImage();

  it('renders through the compiled tables as the plain per-pixel path does, within one code', () => {
    for (const bits of [8, 16] as const) {
      const p = params({ ...doc, exposureMatrix: FITTED }, bits);
      const out = bits === 8 ? new Uint8Array(input.length) : new Uint16Array(input.length);
      applyInversion(compileInversion(p), input, out, 0, input.length / 3);
      expect(worstCodeDifference(p, input, out, 7)).toBeLessThanOrEqual(1);
    }
  });

  it('is the change of primaries: the wide primaries’ matrix as a fitted matrix renders as capturePrimaries wide', () => {
    const named = params({ ...doc, capturePrimaries: 'wide' });
    const fitted = params({ ...doc, exposureMatrix: WIDE_TO_LINEAR_SRGB });
    for (const counts of [
      [20000, 21000, 22000],
      [5000, 30000, 12000],
      [41000, 9000, 26000],
    ] as const)
      expect(invertPixel(fitted, [...counts])).toEqual(invertPixel(named, [...counts]));
  });

  it('takes the place of named capture primaries when a profile has both', () => {
    const both = params({ ...doc, capturePrimaries: 'wide', exposureMatrix: FITTED });
    const fitted = params({ ...doc, exposureMatrix: FITTED });
    expect(invertPixel(both, [20000, 21000, 22000])).toEqual(invertPixel(fitted, [20000, 21000, 22000]));
  });

  it('leaves a profile without one rendering exactly as before: the same bytes as with the field absent', () => {
    const before = params(doc, 8);
    const after = params({ ...doc, exposureMatrix: undefined }, 8);
    const a = new Uint8Array(input.length),
      b = new Uint8Array(input.length);
    applyInversion(compileInversion(before), input, a, 0, input.length / 3);
    applyInversion(compileInversion(after), input, b, 0, input.length / 3);
    expect(Buffer.from(b).equals(Buffer.from(a))).toBe(true);
    expect(compileInversion(before).primaries).toBeNull();
  });

  it('is accepted in a profile document with rows summing to 1, refused at its row otherwise; older documents still pass', () => {
    expect(doc).not.toHaveProperty('exposureMatrix');
    expect(validateProfileDocument(doc).ok).toBe(true);
    expect(validateProfileDocument({ ...doc, exposureMatrix: FITTED }).ok).toBe(true);
    const bad = validateProfileDocument({
      ...doc,
      exposureMatrix: [FITTED[0], [1.2, 0, 0], FITTED[2]],
    });
    expect(bad.ok).toBe(false);
    if (!bad.ok)
      expect(bad.errors).toEqual([
        { path: 'exposureMatrix[1]', message: 'each row must sum to 1 so a grey stays grey' },
      ]);
  });
});
