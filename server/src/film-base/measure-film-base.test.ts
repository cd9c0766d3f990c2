import { LINEAR_SCANNER, POLYCLEAR_200, type FilmBase } from '@clearbase/inversion';
import { describe, expect, it } from 'vitest';
import { demoNegative } from '../cli/synth-command';
import { FilmBaseError } from './film-base-error';
import { measureFilmBase, measureNegativeBase } from './measure-film-base';

const negative = demoNegative({ width: 96, height: 64, stock: POLYCLEAR_200, seed: 1 });
// the rebate of unexposed film along the top 4 rows (synth-command's 6 %, at least 4 px)
const rebate = { x: 8, y: 0, width: 20, height: 3 };

describe('measuring a film base', () => {
  it('detects the rebate’s base and stores it rounded, with the region it used', () => {
    const stored = measureNegativeBase(negative, LINEAR_SCANNER, null);
    const { base, warnings } = measureFilmBase(negative, { base: 'auto', scanner: LINEAR_SCANNER });
    expect(warnings).toEqual([]);
    expect(stored.rgb).toEqual(base.rgb.map((v) => Number(v.toFixed(6))));
    expect(stored.region).not.toBeNull();
    expect(stored.confidence).toBeGreaterThan(0.3);
  });

  it('samples an operator’s rectangle', () => {
    const stored = measureNegativeBase(negative, LINEAR_SCANNER, rebate);
    const { base } = measureFilmBase(negative, { base: [8, 0, 20, 3], scanner: LINEAR_SCANNER });
    expect(stored.rgb).toEqual(base.rgb.map((v) => Number(v.toFixed(6))));
    expect(stored.rgb.every((v) => v > 0 && v <= 1)).toBe(true);
  });

  it('warns of a known base below the confidence threshold, and refuses one with an empty channel', () => {
    const unsure: FilmBase = { rgb: [0.8, 0.7, 0.6], region: [0, 0, 0, 0], confidence: 0.2 };
    expect(measureFilmBase(negative, { base: unsure, scanner: LINEAR_SCANNER }).warnings).toEqual([
      'No reliable film base found (confidence 0.20); check the frame, or draw the base region by hand.',
    ]);
    const empty: FilmBase = { rgb: [0, 0.7, 0.6], region: [0, 0, 0, 0], confidence: 1 };
    expect(() => measureFilmBase(negative, { base: empty, scanner: LINEAR_SCANNER })).toThrow(FilmBaseError);
  });
});
