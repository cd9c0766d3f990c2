import type { Balance, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import {
  addBalances,
  frameRenderParams,
  LOG_EXPOSURE_PER_POINT,
  LOG_EXPOSURE_PER_STOP,
  neutralBalance,
  sumAdjustments,
  summedTone,
  type FrameLevels,
  type InversionParams,
  type InversionProfile,
  type Rgb,
  type SavedAdjustments,
} from '@clearbase/inversion';

/** Printer points on every axis that make the same log exposure as `stops` (a stop is log10 2, a point 0.025). */
export function stopsAsPoints(stops: number): number {
  return (stops * LOG_EXPOSURE_PER_STOP) / LOG_EXPOSURE_PER_POINT;
}

/**
 * The profile a frame previews through: the server's render folded into one profile, so the preview worker's plan
 * builder (which holds E_mid fixed) renders exactly what the server will. Balance = the engine's sum (profile +
 * roll + frame) + grey-world balance of the frame's levels, plus the summed exposure as equal points on the three
 * axes; tone from the levels' black and white points moved by the summed shifts, at the contrast in force.
 * @example previewProfile(profile, levels, roll.adjustments, frame.adjustments).balance.magentaGreen
 */
export function previewProfile(
  profile: ProfileDocument,
  levels: FrameLevels,
  roll: SavedAdjustments,
  frame: SavedAdjustments,
): InversionProfile {
  const sum = sumAdjustments(profile, roll, frame);
  const lift = stopsAsPoints(sum.exposureStops);
  const exposure: Balance = { cyanRed: lift, magentaGreen: lift, yellowBlue: lift };
  return {
    curves: profile.curves,
    crosstalk: profile.crosstalk,
    saturation: profile.saturation,
    balance: addBalances(sum.balance, neutralBalance(levels), exposure),
    tone: summedTone(levels, sum),
    ...(profile.capturePrimaries ? { capturePrimaries: profile.capturePrimaries } : {}),
    // a calibrated profile's change of primaries, which the server's render applies too
    ...(profile.exposureMatrix ? { exposureMatrix: profile.exposureMatrix } : {}),
  };
}

/**
 * The parameters the server renders a frame with (the engine's `frameRenderParams`, which the roll job calls too):
 * what the preview is checked against.
 */
export function serverRenderParams(
  profile: ProfileDocument,
  scanner: ScannerProfile,
  base: Rgb,
  levels: FrameLevels,
  roll: SavedAdjustments,
  frame: SavedAdjustments,
  outputBits: 8 | 16,
): InversionParams {
  return frameRenderParams({ profile, scanner, base, levels, roll, frame, outputBits });
}

/** The parameters of the preview itself, for the neutral picker: the folded profile at the levels' E_mid. */
export function previewParams(
  profile: ProfileDocument,
  scanner: ScannerProfile,
  base: Rgb,
  levels: FrameLevels,
  roll: SavedAdjustments,
  frame: SavedAdjustments,
): InversionParams {
  return {
    profile: previewProfile(profile, levels, roll, frame),
    scanner,
    base,
    midLogExposure: levels.midLogExposure,
    render: 'print',
    outputBits: 8,
  };
}
