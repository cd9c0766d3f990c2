import type { ProfileDocument } from '@clearbase/contracts';
import { stopsToLogExposure } from './printer-points';
import { MID_GREY } from './tone-curve';

/** Options of `meteredMidLogExposure`. */
export interface MeteredExposureOptions {
  /** The exposure index the roll was shot at; default the stock's box speed (the profile's ISO). */
  exposureIndex?: number;
  /** How far the frame was exposed from the meter's reading, stops (+2 = two stops over); default 0. */
  stops?: number;
}

/**
 * E_mid that renders a frame at the profile's metered exposure, with no automatic levels: a stock profile's curves
 * put the metered 18 % grey of a film exposed at its box speed at log10 0.18 (the calibration's bracket is read
 * from that grey), so an 18 % grey card shot at the meter's reading comes out as 18 % reflectance. A roll rated at
 * another exposure index got ISO / EI times the light (log10 of it more), and a frame shot `stops` over got that
 * many stops more (log10 2 each, ISO 5-2's base-10 units); both are taken back so the frame prints by its exposure.
 * Throws a RangeError of the library's one shape for an exposure index that is not above 0 or stops that are not
 * finite.
 * @example meteredMidLogExposure(profile) // log10 0.18 = −0.7447
 * @example meteredMidLogExposure({ stock: { iso: 200 } }, { exposureIndex: 400 }) // −0.7447 − 0.3010: one stop less light
 */
export function meteredMidLogExposure(
  profile: { stock: Pick<ProfileDocument['stock'], 'iso'> },
  options: MeteredExposureOptions = {},
): number {
  const iso = profile.stock.iso;
  const ei = options.exposureIndex ?? iso;
  const stops = options.stops ?? 0;
  if (!(typeof ei === 'number' && Number.isFinite(ei) && ei > 0))
    throw new RangeError(`Expected number above 0 for exposureIndex but received ${ei} of type ${typeof ei}`);
  if (!(typeof stops === 'number' && Number.isFinite(stops)))
    throw new RangeError(`Expected finite number for stops but received ${stops} of type ${typeof stops}`);
  return Math.log10(MID_GREY) + Math.log10(iso / ei) + stopsToLogExposure(stops);
}
