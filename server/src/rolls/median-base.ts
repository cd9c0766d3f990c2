import type { MeasuredBase } from '@clearbase/contracts';
import { rollBase } from '@clearbase/inversion';
import type { FrameRow } from '../orders/order-tables';

/** The roll base from its frames' own bases: their robust median, or null when none was found. */
export function medianBaseOf(frames: readonly FrameRow[]): MeasuredBase | null {
  const bases = frames
    .filter((f) => f.base_mode === 'auto' && f.base_measured)
    .map((f) => JSON.parse(f.base_measured!) as MeasuredBase)
    .filter((b) => b.confidence > 0);
  if (bases.length === 0) return null;
  const median = rollBase(bases.map((b) => ({ rgb: b.rgb, region: [0, 0, 0, 0], confidence: b.confidence })));
  return {
    rgb: median.rgb.map((v) => Number(v.toFixed(6))) as MeasuredBase['rgb'],
    region: null,
    confidence: Number(median.confidence.toFixed(4)),
  };
}
