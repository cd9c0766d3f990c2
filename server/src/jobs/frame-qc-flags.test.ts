import { qcThresholds } from '@clearbase/contracts';
import { LINEAR_SCANNER, POLYCLEAR_200 } from '@clearbase/inversion';
import { describe, expect, it } from 'vitest';
import { demoNegative } from '../cli/synth-command';
import { frameQcFlags } from './frame-qc-flags';

const negativeAt = (exposureStops: number) =>
  demoNegative({ width: 120, height: 80, stock: POLYCLEAR_200, exposureStops, seed: 3 });
const baseGreen = (n: ReturnType<typeof negativeAt>) => n.truth.base[1];
const midGrey = (n: ReturnType<typeof negativeAt>) => new Uint16Array(n.data.length).fill(30000);

describe('QC flags', () => {
  it('flags nothing on a normally exposed frame', () => {
    const n = negativeAt(0);
    expect(frameQcFlags(n, midGrey(n), LINEAR_SCANNER, baseGreen(n))).toEqual([]);
  });

  it(`flags a very thin negative (mean density above base under ${qcThresholds.thinDensity}) and a very dense one (over ${qcThresholds.denseDensity})`, () => {
    const thin = negativeAt(-4);
    expect(frameQcFlags(thin, midGrey(thin), LINEAR_SCANNER, baseGreen(thin))).toEqual(['thin-negative']);
    const dense = negativeAt(5);
    expect(frameQcFlags(dense, midGrey(dense), LINEAR_SCANNER, baseGreen(dense))).toEqual(['dense-negative']);
  });

  it(`flags clipped highlights when more than ${qcThresholds.clippedFraction * 100} % of the positive is at full white`, () => {
    const n = negativeAt(0);
    const positive = midGrey(n);
    positive.fill(65535, 0, Math.ceil(positive.length * 0.05));
    expect(frameQcFlags(n, positive, LINEAR_SCANNER, baseGreen(n))).toEqual(['clipped-highlights']);
  });
});
