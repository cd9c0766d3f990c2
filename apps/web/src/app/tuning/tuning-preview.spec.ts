import type { Adjustments } from '@clearbase/contracts';
import {
  exposeNegative,
  greySteps,
  invertPixel,
  LINEAR_SCANNER,
  measureFrameLevels,
  neutralBalance,
  POLYCLEAR_200,
  profileForStock,
  resolveInversion,
  type Rgb,
} from '@clearbase/inversion';
import { describe, expect, it } from 'vitest';
import { previewParams, previewProfile, serverRenderParams, stopsAsPoints } from './tuning-preview';

const profile = {
  ...profileForStock(POLYCLEAR_200),
  balance: { cyanRed: 1, magentaGreen: -2, yellowBlue: 3 },
};
const negative = exposeNegative(greySteps(6, 0.03, 0.9, 24), {
  stock: POLYCLEAR_200,
  scanner: LINEAR_SCANNER,
  rebate: 6,
});
const base = negative.truth.base;
const levels = measureFrameLevels(
  { profile, scanner: LINEAR_SCANNER, base, render: 'print', outputBits: 8 },
  negative,
);
const roll: Adjustments = {
  balance: { cyanRed: 2, magentaGreen: 4, yellowBlue: -1 },
  exposureStops: 0.5,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};
const frame: Adjustments = {
  balance: { cyanRed: -1, magentaGreen: 3, yellowBlue: 0 },
  exposureStops: -1 / 6,
  contrast: 1.2,
  blackPointStops: 0,
  whitePointStops: 0,
};

describe('the tuning preview', () => {
  it('adds up profile + roll + frame points, the levels’ grey balance and the exposure', () => {
    const folded = previewProfile(profile, levels, roll, frame);
    const grey = neutralBalance(levels);
    const lift = stopsAsPoints(0.5 - 1 / 6);
    expect(folded.balance.cyanRed).toBeCloseTo(1 + 2 - 1 + grey.cyanRed + lift, 10);
    expect(folded.balance.magentaGreen).toBeCloseTo(-2 + 4 + 3 + grey.magentaGreen + lift, 10);
    expect(folded.balance.yellowBlue).toBeCloseTo(3 - 1 + 0 + grey.yellowBlue + lift, 10);
    expect(folded.tone.contrast).toBe(1.2);
  });

  it('counts a stop as 12.04 printer points (log10 2 / 0.025, common practice of the trade, from memory)', () => {
    expect(stopsAsPoints(1)).toBeCloseTo(12.041, 3);
  });

  const rendersAsServer = (
    rollAdjustments: Adjustments,
    frameAdjustments: Adjustments,
    frameProfile: typeof profile = profile,
  ) => {
    const server = serverRenderParams(
      frameProfile,
      LINEAR_SCANNER,
      base,
      levels,
      rollAdjustments,
      frameAdjustments,
      8,
    );
    const preview = previewParams(
      frameProfile,
      LINEAR_SCANNER,
      base,
      levels,
      rollAdjustments,
      frameAdjustments,
    );
    const a = resolveInversion(server);
    const b = resolveInversion(preview);
    for (let c = 0; c < 3; c++) expect(b.offset[c]).toBeCloseTo(a.offset[c]!, 12);
    expect(preview.profile.tone).toEqual(server.profile.tone);
    for (let i = 0; i < negative.data.length; i += 3 * 97) {
      const counts: Rgb = [negative.data[i]!, negative.data[i + 1]!, negative.data[i + 2]!];
      expect(invertPixel(preview, counts, b)).toEqual(invertPixel(server, counts, a));
    }
  };

  it('renders every pixel as the server’s render of the same frame does', () => {
    rendersAsServer(roll, frame);
  });

  it('renders a film recorded in wide primaries as the server does', () => {
    rendersAsServer(roll, frame, { ...profile, capturePrimaries: 'wide' });
  });

  it('renders a calibrated profile, with its exposure matrix, as the server does', () => {
    // rows sum to 1, as the schema asks, so a grey stays grey
    const calibrated = {
      ...profile,
      exposureMatrix: [
        [1.2, -0.15, -0.05],
        [-0.1, 1.15, -0.05],
        [0.02, -0.12, 1.1],
      ] as [[number, number, number], [number, number, number], [number, number, number]],
    };
    rendersAsServer(roll, frame, calibrated);
    expect(previewProfile(calibrated, levels, roll, frame).exposureMatrix).toEqual(calibrated.exposureMatrix);
  });

  it('renders moved black and white points as the server does, and moves them', () => {
    const deeper: Adjustments = { ...roll, blackPointStops: 1 / 2, whitePointStops: -1 / 3 };
    const dimmer: Adjustments = { ...frame, blackPointStops: 1 / 6, whitePointStops: 1 };
    rendersAsServer(deeper, dimmer);
    const moved = previewProfile(profile, levels, deeper, dimmer).tone;
    const still = previewProfile(profile, levels, roll, frame).tone;
    expect(moved.blackPoint).toBeGreaterThan(still.blackPoint);
    expect(moved.whitePoint).toBeGreaterThan(still.whitePoint);
  });
});
