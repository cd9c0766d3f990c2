import { describe, expect, it } from 'vitest';
import {
  exposeNegative,
  gradientScene,
  levelSample,
  levelsToTone,
  measureFrameLevels,
  neutralBalance,
  outdoorScene,
  POLYCLEAR_200,
  profileForStock,
  rollLevels,
  type Rgb,
} from './index';

const scanner = {
  name: 'Test scanner',
  encoding: 'linear' as const,
  gamma: 1,
  blackLevel: [0.001, 0.001, 0.001] as Rgb,
  gains: [1, 1, 1] as Rgb,
};
const profile = profileForStock(POLYCLEAR_200);

function levelsAt(stops: number, scene = outdoorScene(120, 80)) {
  const neg = exposeNegative(scene, { stock: POLYCLEAR_200, scanner, exposureStops: stops, rebate: 8 });
  return measureFrameLevels({ profile, scanner, base: neg.truth.base, render: 'print', outputBits: 8 }, neg, {
    region: neg.truth.frame,
    step: 2,
  });
}

describe('auto exposure and levels', () => {
  it('moves E_mid by log10 2 ± 1 % per stop of film exposure', () => {
    const a = levelsAt(0),
      b = levelsAt(1);
    expect(Math.abs(b.midLogExposure - a.midLogExposure - Math.log10(2)) / Math.log10(2)).toBeLessThan(0.01);
  });
  it('finds no cast on a neutral gradient', () => {
    const balance = neutralBalance(levelsAt(0, gradientScene(64, 8, 0.03, 0.9)));
    for (const v of Object.values(balance)) expect(Math.abs(v)).toBeLessThan(0.5);
  });
  it('puts black below and white above mid grey', () => {
    const l = levelsAt(0);
    const tone = levelsToTone(l, 1.1);
    expect(l.blackLogExposure).toBeLessThan(l.midLogExposure);
    expect(l.whiteLogExposure).toBeGreaterThan(l.midLogExposure);
    expect(tone.blackPoint).toBeLessThan(0.18);
    expect(tone.whitePoint).toBeGreaterThan(0.18);
  });
  it('measures the same levels from its default strided sample as from every pixel', () => {
    const neg = exposeNegative(outdoorScene(900, 600), {
      stock: POLYCLEAR_200,
      scanner,
      grain: 0.01,
      seed: 5,
    });
    const params = {
      profile,
      scanner,
      base: neg.truth.base,
      render: 'print' as const,
      outputBits: 8 as const,
    };
    const sampled = measureFrameLevels(params, neg);
    const every = measureFrameLevels(params, neg, { step: 1 });
    expect(sampled.midLogExposure).toBeCloseTo(every.midLogExposure, 2);
    sampled.channelMeans.forEach((v, c) => expect(v).toBeCloseTo(every.channelMeans[c]!, 2));
    expect(sampled.blackLogExposure).toBeCloseTo(every.blackLogExposure, 1);
    expect(sampled.whiteLogExposure).toBeCloseTo(every.whiteLogExposure, 1);
    expect(measureFrameLevels(params, levelSample(neg), { step: 1 })).toEqual(sampled);
  });
  it('keeps roll-wide levels with each frame deviating by its own exposure', () => {
    const { roll, deviations } = rollLevels([levelsAt(-1), levelsAt(0), levelsAt(1)]);
    expect(deviations[1]!.midLogExposure).toBeCloseTo(0, 2);
    expect(deviations[2]!.midLogExposure - deviations[0]!.midLogExposure).toBeCloseTo(2 * Math.log10(2), 2);
    expect(roll.midLogExposure).toBeCloseTo(levelsAt(0).midLogExposure, 2);
  });
});
