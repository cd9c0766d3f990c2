import type { ProfileDocument } from '@clearbase/contracts';
import { meteredMidLogExposure, MID_GREY, type FrameLevels } from '@clearbase/inversion';

// Darkest black point a profile's tone stands for here: log10 of it stays finite (our choice, well below 8-bit black).
const LEAST_POINT = 1e-4;

/**
 * Levels that render a frame at the profile's metered exposure for the roll's exposure index, with no automatic
 * levels: E_mid from `meteredMidLogExposure`, equal channel means (no grey-world balance) and the black and white
 * log exposures at which the profile's own tone puts its black and white points, so the roll's and the frame's
 * point shifts still move them.
 * @example meteredLevels(profile, 400).midLogExposure // log10 0.18 − log10(400 / ISO)
 */
export function meteredLevels(profile: ProfileDocument, exposureIndex: number): FrameLevels {
  const mid = meteredMidLogExposure(profile, { exposureIndex });
  const { contrast, blackPoint, whitePoint } = profile.tone;
  const at = (point: number) => mid + Math.log10(Math.max(LEAST_POINT, point) / MID_GREY) / contrast;
  return {
    midLogExposure: mid,
    channelMeans: [mid, mid, mid],
    blackLogExposure: at(blackPoint),
    whiteLogExposure: at(whitePoint),
  };
}
