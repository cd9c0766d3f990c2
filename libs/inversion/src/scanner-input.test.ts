import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { encodeScannerValue, LINEAR_SCANNER, linearise, srgbDecode } from './index';

describe('scanner input profile', () => {
  it('decodes sRGB-encoded counts with the IEC 61966-2-1 curve', () => {
    expect(linearise(0.5, { ...LINEAR_SCANNER, encoding: 'srgb' }, 1)).toBeCloseTo(srgbDecode(0.5), 12);
  });
  it('subtracts the black level and applies the channel gain', () => {
    const scanner = {
      ...LINEAR_SCANNER,
      blackLevel: [0.01, 0.02, 0.03] as [number, number, number],
      gains: [2, 1, 0.5] as [number, number, number],
    };
    expect(linearise(0.51, scanner, 0)).toBeCloseTo(1, 12);
    expect(linearise(0.02, scanner, 1)).toBeCloseTo(0, 12);
    expect(linearise(1.03, scanner, 2)).toBeCloseTo(0.5, 12);
  });
  it('round-trips light through any encoding, black level and gain (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('linear' as const, 'srgb' as const, 'gamma' as const),
        fc.double({ min: 1, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 0.05, noNaN: true }),
        fc.double({ min: 0.8, max: 1.5, noNaN: true }),
        fc.double({ min: 0.001, max: 0.75, noNaN: true }),
        (encoding, gamma, black, gain, light) => {
          const scanner = {
            name: 'p',
            encoding,
            gamma,
            blackLevel: [black, black, black] as [number, number, number],
            gains: [gain, gain, gain] as [number, number, number],
          };
          expect(linearise(encodeScannerValue(light, scanner, 0), scanner, 0)).toBeCloseTo(light, 8);
        },
      ),
    );
  });
});
