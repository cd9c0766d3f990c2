import type { MeasuredBase } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { chooseFilmBase } from './choose-film-base';
import { MIN_BASE_CONFIDENCE } from './min-base-confidence';

const base = (rgb: [number, number, number], confidence: number): MeasuredBase => ({
  rgb,
  region: { x: 0, y: 0, width: 40, height: 4 },
  confidence,
});
const own = base([0.8, 0.7, 0.6], 0.9);
const roll = { rgb: [0.82, 0.71, 0.61] as [number, number, number], region: null, confidence: 0.8 };

describe('the film base a frame renders with', () => {
  it('takes the operator’s rectangle first, however unsure, without a flag', () => {
    const choice = chooseFilmBase({ mode: 'region', measured: base([0.5, 0.5, 0.5], 0.05) }, roll);
    expect(choice).toEqual({
      usable: true,
      base: { rgb: [0.5, 0.5, 0.5], region: [0, 0, 40, 4], confidence: 0.05 },
      source: 'region',
      flags: [],
    });
  });

  it('takes the frame’s own detected base when it is at least the threshold sure', () => {
    const choice = chooseFilmBase(
      { mode: 'auto', measured: base([0.8, 0.7, 0.6], MIN_BASE_CONFIDENCE) },
      roll,
    );
    expect(choice).toMatchObject({ usable: true, source: 'frame', flags: [] });
  });

  it('falls back on the roll base, flagged, when the frame’s own base is below the threshold', () => {
    const choice = chooseFilmBase({ mode: 'auto', measured: base([0.8, 0.7, 0.6], 0.29) }, roll);
    expect(choice).toEqual({
      usable: true,
      base: { rgb: roll.rgb, region: [0, 0, 0, 0], confidence: 0.8 },
      source: 'roll',
      flags: ['roll-base-used'],
    });
  });

  it('falls back on the roll base when the frame found none, or its rectangle held no film', () => {
    expect(chooseFilmBase({ mode: 'auto', measured: null }, roll)).toMatchObject({ source: 'roll' });
    expect(chooseFilmBase({ mode: 'region', measured: base([0.8, 0.7, 0.6], 0) }, roll)).toMatchObject({
      source: 'roll',
    });
  });

  it('does not trust a base with a channel outside (0, 1], however sure', () => {
    expect(chooseFilmBase({ mode: 'auto', measured: base([0, 0.7, 0.6], 1) }, roll)).toMatchObject({
      source: 'roll',
    });
    expect(chooseFilmBase({ mode: 'auto', measured: base([1.2, 0.7, 0.6], 1) }, roll)).toMatchObject({
      source: 'roll',
    });
  });

  it('flags the frame for QC, with a reason a person can act on, when neither frame nor roll has a base', () => {
    const choice = chooseFilmBase({ mode: 'auto', measured: base([0.8, 0.7, 0.6], 0.1) }, null);
    expect(choice).toEqual({
      usable: false,
      flags: ['no-base'],
      reason:
        'No usable film base in this frame nor on the roll; draw the base by hand over the rebate or leader.',
    });
    expect(chooseFilmBase({ mode: 'auto', measured: null }, { ...roll, confidence: 0 })).toMatchObject({
      usable: false,
    });
  });

  it('prefers a confident frame base to the roll base', () => {
    expect(chooseFilmBase({ mode: 'auto', measured: own }, roll)).toMatchObject({
      base: { rgb: own.rgb },
      source: 'frame',
    });
  });
});
