import { describe, expect, it } from 'vitest';
import { retryDelayMs } from './retry-delay';

describe('retryDelayMs', () => {
  it('waits 30 s after the first failure and doubles from there', () => {
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([30_000, 60_000, 120_000, 240_000]);
  });

  it('never waits longer than an hour', () => {
    expect(retryDelayMs(8)).toBe(3600_000);
    expect(retryDelayMs(11)).toBe(3600_000);
  });

  it('gives up at the twelfth failure', () => {
    expect(retryDelayMs(12)).toBeNull();
  });
});
