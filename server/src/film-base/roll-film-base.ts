import type { MeasuredBase } from '@clearbase/contracts';
import { rollBase } from '@clearbase/inversion';
import type { FilmBaseFacts } from './film-base-facts';

/**
 * The robust median (`rollBase`) of the bases the frames found on their own, or null when none found any; frames
 * with a drawn rectangle do not count.
 *
 * @example medianOfFrameBases([{ mode: 'auto', measured }, { mode: 'region', measured: drawn }]) // measured, region null
 */
export function medianOfFrameBases(frames: readonly FilmBaseFacts[]): MeasuredBase | null {
  const bases = frames
    .filter((f) => f.mode === 'auto' && f.measured)
    .map((f) => f.measured!)
    .filter((b) => b.confidence > 0);
  if (bases.length === 0) return null;
  const median = rollBase(bases.map((b) => ({ rgb: b.rgb, region: [0, 0, 0, 0], confidence: b.confidence })));
  return {
    rgb: median.rgb.map((v) => Number(v.toFixed(6))) as MeasuredBase['rgb'],
    region: null,
    confidence: Number(median.confidence.toFixed(4)),
  };
}

/**
 * The base a roll's frames fall back on: sampled in a rectangle on one of its frames (the leader) when an operator
 * drew one, else the robust median of its frames' own bases.
 *
 * @example rollFilmBase({ mode: 'auto', measured: null }, frames) // medianOfFrameBases(frames)
 */
export function rollFilmBase(roll: FilmBaseFacts, frames: readonly FilmBaseFacts[]): MeasuredBase | null {
  return roll.mode === 'region' ? roll.measured : medianOfFrameBases(frames);
}
