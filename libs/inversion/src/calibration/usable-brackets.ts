import type { Rgb } from '../srgb';
import type { RegionSample } from './sample-region';
import { BLANK_DENSITY, type CalibrationWarning } from './calibration-warning';

/** A grey frame the fit may use: its index in the bracket, its stops and its densities above base. */
export interface UsableBracket {
  frame: number;
  stops: number;
  densities: Rgb;
}

/**
 * The grey frames of a bracket a fit can use, with a warning or a notice in `warnings` for each one left out: an
 * empty or clipped grey rectangle; a frame within BLANK_DENSITY of the base in every channel — below the toe when
 * every frame under it is as thin (a notice), blank when a frame given less exposure has density (it never saw
 * light: a warning). Throws a RangeError for stops that are not finite.
 * @example usableBrackets(brackets, (rgb) => densities, warnings).map((u) => u.frame) // e.g. [3, 4, 5, …]
 */
export function usableBrackets(
  brackets: readonly { stops: number; sample: RegionSample }[],
  density: (rgb: Rgb) => Rgb,
  warnings: CalibrationWarning[],
): UsableBracket[] {
  const usable: UsableBracket[] = [];
  brackets.forEach((b, frame) => {
    const label = `Grey frame ${frame + 1} (${formatStops(b.stops)})`;
    if (!Number.isFinite(b.stops))
      throw new RangeError(`Expected finite stops for bracket ${frame} but received ${b.stops}`);
    if (b.sample.status === 'empty') {
      warnings.push({
        severity: 'warning',
        code: 'clipped-frame',
        frame,
        message: `${label}: the grey rectangle holds no usable pixels; it was left out.`,
      });
      return;
    }
    if (b.sample.status === 'clipped') {
      const pct = Math.round(100 * (b.sample.clippedFraction + b.sample.darkFraction));
      warnings.push({
        severity: 'warning',
        code: 'clipped-frame',
        frame,
        message: `${label}: ${pct} % of the grey rectangle is clipped (bare light or too dense to read); it was left out. Rescan it with the scanner exposure adjusted.`,
      });
      return;
    }
    usable.push({ frame, stops: b.stops, densities: density(b.sample.rgb) });
  });
  // Frames with no density above base: below the toe when every frame under them is as thin (left out, a
  // notice); blank when a frame given less exposure has density (a frame that never saw light, a warning).
  const nearBase = (u: { densities: Rgb }) => u.densities.every((d) => d < BLANK_DENSITY);
  for (const u of [...usable].filter(nearBase)) {
    const label = `Grey frame ${u.frame + 1} (${formatStops(u.stops)})`;
    const blank = usable.some((o) => o.stops < u.stops && !nearBase(o));
    warnings.push(
      blank
        ? {
            severity: 'warning',
            code: 'blank-frame',
            frame: u.frame,
            message: `${label}: the grey is within ${BLANK_DENSITY} of the film base in every channel although less exposed frames are denser — the frame looks unexposed; it was left out.`,
          }
        : {
            severity: 'notice',
            code: 'below-toe',
            frame: u.frame,
            message: `${label}: no density above the base yet (under ${BLANK_DENSITY}); it lies below the toe and was left out.`,
          },
    );
    usable.splice(usable.indexOf(u), 1);
  }
  return usable;
}

/** Stops as people write them: +1.5 stops, -2 stops. */
export function formatStops(stops: number): string {
  return `${stops > 0 ? '+' : ''}${Number(stops.toFixed(2))} stops`;
}
