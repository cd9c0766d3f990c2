import type { Adjustments } from '@clearbase/contracts';
import { stopsLabel } from './stops-label';

const signed = (n: number) => `${n > 0 ? '+' : ''}${n}`;

/**
 * The tuning a frame carries, in a few words for its place in the frame strip: only what differs from no tuning,
 * casts as printer points per axis, shifts in stops, contrast as a factor of the profile's γ.
 * @example tuningSummary({ ...noTuning, balance: { cyanRed: 0, magentaGreen: 3, yellowBlue: 0 } }) // 'MG +3'
 */
export function tuningSummary(a: Adjustments): string {
  const parts: string[] = [];
  const b = a.balance;
  if (b.cyanRed) parts.push(`CR ${signed(b.cyanRed)}`);
  if (b.magentaGreen) parts.push(`MG ${signed(b.magentaGreen)}`);
  if (b.yellowBlue) parts.push(`YB ${signed(b.yellowBlue)}`);
  if (a.exposureStops) parts.push(stopsLabel(a.exposureStops));
  if (a.contrast !== null) parts.push(`γ× ${a.contrast}`);
  if (a.blackPointStops) parts.push(`black ${stopsLabel(a.blackPointStops)}`);
  if (a.whitePointStops) parts.push(`white ${stopsLabel(a.whitePointStops)}`);
  return parts.join(' · ');
}
