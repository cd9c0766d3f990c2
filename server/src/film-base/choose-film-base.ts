import type { MeasuredBase, QcFlag } from '@clearbase/contracts';
import type { FilmBase } from '@clearbase/inversion';
import type { FilmBaseFacts } from './film-base-facts';
import { toFilmBase } from './measured-base';
import { MIN_BASE_CONFIDENCE } from './min-base-confidence';

/** The base a frame renders with and where it came from, or why it has none (the frame is flagged for QC). */
export type FilmBaseChoice =
  | { usable: true; base: FilmBase; source: 'region' | 'frame' | 'roll'; flags: QcFlag[] }
  | { usable: false; flags: ['no-base']; reason: string };

/** A base every channel of which lies in (0, 1] and that is at least this confident. */
function usable(base: MeasuredBase | null, minConfidence: number): base is MeasuredBase {
  return base !== null && base.rgb.every((v) => v > 0 && v <= 1) && base.confidence >= minConfidence;
}

/**
 * The lab's rule for the base a frame is inverted against, in order: the operator's rectangle on the frame (any
 * film found in it), the frame's own detected base when at least `MIN_BASE_CONFIDENCE` sure, the roll base
 * (flagged `roll-base-used`). With none usable the frame is not rendered but flagged `no-base`: never silently wrong.
 *
 * @example
 * chooseFilmBase({ mode: 'auto', measured: { rgb: [0.8, 0.7, 0.6], region: null, confidence: 0.1 } }, rollBase)
 * // { usable: true, base: toFilmBase(rollBase), source: 'roll', flags: ['roll-base-used'] }
 */
export function chooseFilmBase(frame: FilmBaseFacts, rollBase: MeasuredBase | null): FilmBaseChoice {
  const own = frame.measured;
  if (frame.mode === 'region' && usable(own, Number.MIN_VALUE))
    return { usable: true, base: toFilmBase(own), source: 'region', flags: [] };
  if (frame.mode === 'auto' && usable(own, MIN_BASE_CONFIDENCE))
    return { usable: true, base: toFilmBase(own), source: 'frame', flags: [] };
  if (usable(rollBase, Number.MIN_VALUE))
    return { usable: true, base: toFilmBase(rollBase), source: 'roll', flags: ['roll-base-used'] };
  return {
    usable: false,
    flags: ['no-base'],
    reason:
      'No usable film base in this frame nor on the roll; draw the base by hand over the rebate or leader.',
  };
}
