import { describe, expect, it } from 'vitest';
import { stopsLabel } from './stops-label';

describe('stops label', () => {
  it('writes sixths of a stop as halves and thirds where they fall', () => {
    expect(stopsLabel(1 / 6)).toBe('+1/6 stop');
    expect(stopsLabel(2 / 6)).toBe('+1/3 stop');
    expect(stopsLabel(0.5)).toBe('+1/2 stop');
    expect(stopsLabel(4 / 6)).toBe('+2/3 stop');
    expect(stopsLabel(5 / 6)).toBe('+5/6 stop');
  });

  it('puts whole stops before the fraction, a minus sign before a negative shift, and no sign on zero', () => {
    expect(stopsLabel(1)).toBe('+1 stop');
    expect(stopsLabel(-1)).toBe('−1 stop');
    expect(stopsLabel(-1.5)).toBe('−1 1/2 stops');
    expect(stopsLabel(3)).toBe('+3 stops');
    expect(stopsLabel(-(2 + 1 / 3))).toBe('−2 1/3 stops');
    expect(stopsLabel(0)).toBe('0 stops');
    expect(stopsLabel(-0)).toBe('0 stops');
  });

  it('rounds to the nearest sixth', () => {
    expect(stopsLabel(0.34)).toBe('+1/3 stop');
    expect(stopsLabel(0.3333333333333333 + 0.3333333333333333)).toBe('+2/3 stop');
  });
});
