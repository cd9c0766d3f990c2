import { describe, expect, it } from 'vitest';
import { createMonotoneCurve } from '../monotone-curve';
import { LOG_EXPOSURE_PER_POINT } from '../printer-points';
import { bracketBalance } from './bracket-balance';

// A straight green curve of γ 0.6 through density 0.7 at the metered grey.
const green = createMonotoneCurve([-1, 1], [0.1, 1.3]);

describe('bracket balance', () => {
  it('gives the same balance at every exposure when the channels’ curves are parallel', () => {
    // Red 0.03 D denser than green everywhere: 0.03 / 0.6 = 0.05 log E = 2 points (0.025 log E each, common practice).
    const frames = [-1, 0, 1, 2].map((stops) => {
      const d = 0.7 + 0.6 * stops * Math.log10(2);
      return { stops, densities: [d + 0.03, d, d] as [number, number, number] };
    });
    const b = bracketBalance(frames, green);
    expect(b.largestRange).toBeCloseTo(0, 9);
    const redExcess = 0.05 / LOG_EXPOSURE_PER_POINT;
    // The red surplus is shared against the luminance-weighted mean (Rec. 709 weights: red 0.2126).
    expect(b.mean.cyanRed).toBeCloseTo(-redExcess * (1 - 0.2126), 9);
    expect(b.mean.magentaGreen).toBeCloseTo(redExcess * 0.2126, 9);
  });

  it('drifts along the bracket when a channel’s γ differs, by the crossover in points', () => {
    // Blue γ 0.7 against green 0.6: over 4 stops the blue excess grows by 0.1 × 4 × 0.30103 D = 0.2007 log E × (1/0.6).
    const frames = [-2, 2].map((stops) => {
      const x = stops * Math.log10(2);
      return { stops, densities: [0.7 + 0.6 * x, 0.7 + 0.6 * x, 0.7 + 0.7 * x] as [number, number, number] };
    });
    const b = bracketBalance(frames, green);
    const drift = (0.1 * 4 * Math.log10(2)) / 0.6 / LOG_EXPOSURE_PER_POINT;
    expect(b.range.yellowBlue).toBeCloseTo(drift * (1 - 0.0722), 6);
    expect(b.standardDeviation.yellowBlue).toBeCloseTo((drift * (1 - 0.0722)) / 2, 6);
    expect(b.frames[0]!.balance.yellowBlue).toBeGreaterThan(0);
  });

  it('refuses an empty bracket', () => {
    expect(() => bracketBalance([], green)).toThrow('Expected at least 1 grey frame but received 0');
  });
});
