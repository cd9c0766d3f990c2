import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CHART_NEUTRAL_INDICES, CHART_REFERENCE } from './chart-reference';

// Published L*a*b* D50 of the 24-patch chart (McCamy et al. 1976; maker's 2016 values), kept with its source
// in test-data/reference/colour-rendition-chart-24.csv.
const rows = readFileSync(
  new URL('../../../../test-data/reference/colour-rendition-chart-24.csv', import.meta.url),
  'utf8',
)
  .split('\n')
  .filter((l) => l && !l.startsWith('#'))
  .slice(1)
  .map((l) => l.split(','));

describe('chart reference', () => {
  it('holds the 24 published L*a*b* D50 values in row order, as the reference table gives them', () => {
    expect(CHART_REFERENCE).toHaveLength(24);
    rows.forEach((f, i) => {
      expect(CHART_REFERENCE[i]).toEqual({
        index: Number(f[0]),
        name: f[1],
        labD50: [Number(f[2]), Number(f[3]), Number(f[4])],
      });
    });
  });

  it('names the bottom row, white to black, as the neutral row', () => {
    expect(CHART_NEUTRAL_INDICES.map((i) => CHART_REFERENCE[i - 1]!.name)).toEqual([
      'white 9.5',
      'neutral 8',
      'neutral 6.5',
      'neutral 5',
      'neutral 3.5',
      'black 2',
    ]);
  });
});
