import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { percentilePair } from './frame-levels';
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
  shiftLevelPoints,
  toneCurve,
  MIN_POINT_GAP_LOG_EXPOSURE,
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

describe('black and white point shifts', () => {
  const levels = levelsAt(0);
  const stop = Math.log10(2); // one stop of exposure is a factor of 2: log10 2 of log exposure

  it('moves each point by log10 2 of log exposure a stop, leaving E_mid and the channel means', () => {
    const shifted = shiftLevelPoints(levels, 1, -0.5);
    expect(shifted.blackLogExposure - levels.blackLogExposure).toBeCloseTo(stop, 12);
    expect(shifted.whiteLogExposure - levels.whiteLogExposure).toBeCloseTo(-0.5 * stop, 12);
    expect(shifted.midLogExposure).toBe(levels.midLogExposure);
    expect(shifted.channelMeans).toEqual(levels.channelMeans);
    expect(shiftLevelPoints(levels, 0, 0)).toEqual(levels);
  });

  it('prints deeper blacks when the black point moves to more exposure', () => {
    const shadow = levels.blackLogExposure + 0.5 * stop - levels.midLogExposure;
    const before = levelsToTone(levels, 1.1);
    const after = levelsToTone(shiftLevelPoints(levels, 1, 0), 1.1);
    expect(after.blackPoint).toBeGreaterThan(before.blackPoint);
    expect(toneCurve(shadow, before)).toBeGreaterThan(0);
    expect(toneCurve(shadow, after)).toBe(0);
  });

  it('prints dimmer highlights when the white point moves to more exposure', () => {
    const highlight = levels.whiteLogExposure - levels.midLogExposure;
    const before = levelsToTone(levels, 1.1);
    const after = levelsToTone(shiftLevelPoints(levels, 0, 1), 1.1);
    expect(toneCurve(highlight, before)).toBeCloseTo(1, 9);
    expect(toneCurve(highlight, after)).toBeLessThan(0.6);
  });

  it('keeps the white point above the black point however far they are pushed', () => {
    const crossed = shiftLevelPoints(levels, 3, -3);
    expect(crossed.whiteLogExposure - crossed.blackLogExposure).toBeCloseTo(MIN_POINT_GAP_LOG_EXPOSURE, 12);
    const tone = levelsToTone(crossed, 1);
    expect(tone.whitePoint).toBeGreaterThan(tone.blackPoint);
  });

  it('refuses a shift that is not a number', () => {
    expect(() => shiftLevelPoints(levels, Number.NaN, 0)).toThrow(RangeError);
  });
});

describe('percentilePair', () => {
  it('reads the same two ranks as a full sort does (property)', () => {
    fc.assert(
      fc.property(
        // + 0 turns −0 into 0: a sort orders the two, a selection (rightly) does not.
        fc.array(
          fc.double({ min: -6, max: 3, noNaN: true }).map((v) => v + 0),
          { minLength: 1, maxLength: 400 },
        ),
        fc.double({ min: 0, max: 0.5, noNaN: true }),
        (values, q) => {
          const sorted = Float64Array.from(values).sort();
          const at = (p: number) => sorted[Math.round(p * (sorted.length - 1))]!;
          expect(percentilePair(Float64Array.from(values), q)).toEqual([at(q), at(1 - q)]);
        },
      ),
      { numRuns: 200 },
    );
  });
  it('gives zeros for no values', () => {
    expect(percentilePair(new Float64Array(0), 0.005)).toEqual([0, 0]);
  });
});
