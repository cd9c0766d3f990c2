import type { Adjustments, Balance, ProfileDocument, ScannerProfile, Tone } from '@clearbase/contracts';
import { levelsToTone, neutralBalance, shiftLevelPoints, type FrameLevels } from './frame-levels';
import type { InversionParams } from './invert-pixel';
import { addBalances } from './printer-points';
import type { Rgb } from './srgb';

/**
 * A roll's or a frame's adjustments as they are stored: the black and white point shifts may be missing from
 * adjustments saved before they existed, and then read as 0.
 */
export type SavedAdjustments = Pick<Adjustments, 'balance' | 'exposureStops' | 'contrast'> &
  Partial<Pick<Adjustments, 'blackPointStops' | 'whitePointStops'>>;

/** The adjustments one frame renders with once its roll's and its own are put together, over a profile. */
export interface SummedAdjustments {
  /** Printer points: profile + roll + frame. */
  balance: Balance;
  /** Stops: roll + frame. */
  exposureStops: number;
  /** The frame's contrast when set, else the roll's, else the profile's. */
  contrast: number;
  /** Stops the black point moves to more exposure: roll + frame. */
  blackPointStops: number;
  /** Stops the white point moves to more exposure: roll + frame. */
  whitePointStops: number;
}

/**
 * Puts a profile's, a roll's and a frame's adjustments together the way every render does, on the server and in
 * the browser's preview alike: balances, exposures and black and white point shifts add; contrast is the nearest
 * one set.
 * @example sumAdjustments(profile, roll, frame).balance.magentaGreen // profile + roll + frame magenta–green points
 */
export function sumAdjustments(
  profile: Pick<ProfileDocument, 'balance' | 'tone'>,
  roll: SavedAdjustments,
  frame: SavedAdjustments,
): SummedAdjustments {
  return {
    balance: addBalances(profile.balance, roll.balance, frame.balance),
    exposureStops: roll.exposureStops + frame.exposureStops,
    contrast: frame.contrast ?? roll.contrast ?? profile.tone.contrast,
    blackPointStops: (roll.blackPointStops ?? 0) + (frame.blackPointStops ?? 0),
    whitePointStops: (roll.whitePointStops ?? 0) + (frame.whitePointStops ?? 0),
  };
}

/**
 * The print tone a frame renders with: the levels' black and white points moved by the summed shifts, at the
 * contrast in force.
 * @example summedTone(levels, sumAdjustments(profile, roll, frame)).blackPoint
 */
export function summedTone(levels: FrameLevels, sum: SummedAdjustments): Tone {
  return levelsToTone(shiftLevelPoints(levels, sum.blackPointStops, sum.whitePointStops), sum.contrast);
}

/** What a frame's render is made from. */
export interface FrameRenderInput {
  profile: ProfileDocument;
  scanner: ScannerProfile;
  /** Film base, linear light 0..1 per channel. */
  base: Rgb;
  /** The frame's own levels, or the roll's when the roll renders with roll-wide levels. */
  levels: FrameLevels;
  roll: SavedAdjustments;
  frame: SavedAdjustments;
  outputBits: 8 | 16;
}

/**
 * The inversion parameters of a frame's print render: the summed balance plus the levels' grey-world balance, the
 * summed exposure, E_mid from the levels and the tone from the levels' shifted points at the contrast in force.
 * @example compileInversion(frameRenderParams({ profile, scanner, base, levels, roll, frame, outputBits: 16 }))
 */
export function frameRenderParams(input: FrameRenderInput): InversionParams {
  const sum = sumAdjustments(input.profile, input.roll, input.frame);
  return {
    profile: { ...input.profile, balance: sum.balance, tone: summedTone(input.levels, sum) },
    scanner: input.scanner,
    base: input.base,
    balances: [neutralBalance(input.levels)],
    exposureStops: sum.exposureStops,
    midLogExposure: input.levels.midLogExposure,
    render: 'print',
    outputBits: input.outputBits,
  };
}
