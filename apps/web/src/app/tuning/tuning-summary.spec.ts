import type { Adjustments } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { tuningSummary } from './tuning-summary';

const none: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

describe('tuningSummary', () => {
  it('says nothing of a frame without tuning', () => {
    expect(tuningSummary(none)).toBe('');
  });

  it('names only what is tuned, casts with their sign, in a fixed order', () => {
    expect(
      tuningSummary({
        balance: { cyanRed: -2, magentaGreen: 0, yellowBlue: 4 },
        exposureStops: 1 / 3,
        contrast: 1.1,
        blackPointStops: 1 / 6,
        whitePointStops: -1 / 2,
      }),
    ).toBe('CR -2 · YB +4 · +1/3 stop · γ× 1.1 · black +1/6 stop · white −1/2 stop');
  });

  it('keeps a contrast set back to the profile’s factor of one', () => {
    expect(tuningSummary({ ...none, contrast: 1 })).toBe('γ× 1');
  });
});
