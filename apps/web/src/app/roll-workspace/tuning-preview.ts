import type { Adjustments, Balance, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import {
  addBalances,
  levelsToTone,
  LOG_EXPOSURE_PER_POINT,
  LOG_EXPOSURE_PER_STOP,
  neutralBalance,
  type FrameLevels,
  type InversionParams,
  type InversionProfile,
  type Rgb,
} from '@clearbase/inversion';

/**
 * Profile + roll + frame: balances and exposures add, the nearest contrast set wins. The same sum as the contracts'
 * `sumAdjustments`, written here because the browser takes only types from the contracts (they carry zod).
 */
export function sumAdjustments(
  profile: Pick<ProfileDocument, 'balance' | 'tone'>,
  roll: Adjustments,
  frame: Adjustments,
): { balance: Balance; exposureStops: number; contrast: number } {
  return {
    balance: addBalances(profile.balance, roll.balance, frame.balance),
    exposureStops: roll.exposureStops + frame.exposureStops,
    contrast: frame.contrast ?? roll.contrast ?? profile.tone.contrast,
  };
}

/** Printer points on every axis that make the same log exposure as `stops` (a stop is log10 2, a point 0.025). */
export function stopsAsPoints(stops: number): number {
  return (stops * LOG_EXPOSURE_PER_STOP) / LOG_EXPOSURE_PER_POINT;
}

/**
 * The profile a frame previews through: the server's render folded into one profile, so the preview worker's plan
 * builder (which holds E_mid fixed) renders exactly what the server will. Balance = profile + grey-world balance of
 * the frame's levels + roll + frame, plus the summed exposure as equal points on the three axes; tone from the
 * levels at the contrast in force.
 * @example previewProfile(profile, levels, roll.adjustments, frame.adjustments).balance.magentaGreen
 */
export function previewProfile(
  profile: ProfileDocument,
  levels: FrameLevels,
  roll: Adjustments,
  frame: Adjustments,
): InversionProfile {
  const sum = sumAdjustments(profile, roll, frame);
  const lift = stopsAsPoints(sum.exposureStops);
  const exposure: Balance = { cyanRed: lift, magentaGreen: lift, yellowBlue: lift };
  return {
    curves: profile.curves,
    crosstalk: profile.crosstalk,
    saturation: profile.saturation,
    balance: addBalances(sum.balance, neutralBalance(levels), exposure),
    tone: levelsToTone(levels, sum.contrast),
  };
}

/**
 * The parameters the server renders a frame with (the roll job's sum: profile, grey-world balance, roll, frame,
 * exposures added, the nearest contrast): what the preview is checked against.
 */
export function serverRenderParams(
  profile: ProfileDocument,
  scanner: ScannerProfile,
  base: Rgb,
  levels: FrameLevels,
  roll: Adjustments,
  frame: Adjustments,
  outputBits: 8 | 16,
): InversionParams {
  const contrast = frame.contrast ?? roll.contrast ?? profile.tone.contrast;
  return {
    profile: { ...profile, tone: levelsToTone(levels, contrast) },
    scanner,
    base,
    balances: [neutralBalance(levels), roll.balance, frame.balance],
    exposureStops: roll.exposureStops + frame.exposureStops,
    midLogExposure: levels.midLogExposure,
    render: 'print',
    outputBits,
  };
}

/** The parameters of the preview itself, for the neutral picker: the folded profile at the levels' E_mid. */
export function previewParams(
  profile: ProfileDocument,
  scanner: ScannerProfile,
  base: Rgb,
  levels: FrameLevels,
  roll: Adjustments,
  frame: Adjustments,
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
