import { describe, expect, it } from 'vitest';
import { isotonicRegression } from './isotonic-regression';

describe('isotonic regression', () => {
  it('pools a pair that goes down into its mean', () => {
    expect(isotonicRegression([1, 3, 2, 4])).toEqual([1, 2.5, 2.5, 4]);
  });
  it('leaves a rising series as it is', () => {
    expect(isotonicRegression([0.1, 0.2, 0.5, 0.9])).toEqual([0.1, 0.2, 0.5, 0.9]);
  });
  it('pools backwards over several blocks, weighting by the weights', () => {
    expect(isotonicRegression([1, 5, 4, 0], [1, 1, 1, 2])).toEqual([1, 2.25, 2.25, 2.25].map((v) => v));
    expect(isotonicRegression([3, 1], [3, 1])).toEqual([2.5, 2.5]);
  });
  it('refuses weights that are not positive', () => {
    expect(() => isotonicRegression([1, 2], [1, 0])).toThrow(
      'Expected number above 0 for weights[1] but received 0 of type number',
    );
  });
});
