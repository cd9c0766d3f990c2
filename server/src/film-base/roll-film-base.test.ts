import type { MeasuredBase } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { medianOfFrameBases, rollFilmBase } from './roll-film-base';

const measured = (rgb: [number, number, number], confidence: number): MeasuredBase => ({
  rgb,
  region: { x: 0, y: 0, width: 40, height: 4 },
  confidence,
});

describe('the roll base', () => {
  it('is the leader rectangle an operator drew, whatever the frames found', () => {
    const leader = measured([0.5, 0.4, 0.3], 0.7);
    const frames = [{ mode: 'auto' as const, measured: measured([0.8, 0.7, 0.6], 0.9) }];
    expect(rollFilmBase({ mode: 'region', measured: leader }, frames)).toBe(leader);
  });

  it('is otherwise the median of the frames’ own bases, one wild frame left out, rounded as stored', () => {
    const frames = [
      { mode: 'auto' as const, measured: measured([0.8, 0.7, 0.6], 0.9) },
      { mode: 'auto' as const, measured: measured([0.81, 0.71, 0.61], 0.8) },
      { mode: 'auto' as const, measured: measured([0.2, 0.9, 0.1], 0.9) },
    ];
    const roll = rollFilmBase({ mode: 'auto', measured: null }, frames)!;
    expect(roll.region).toBeNull();
    expect(roll.rgb[0]).toBeCloseTo(0.8, 1);
    expect(roll.rgb[2]).toBeCloseTo(0.6, 1);
    expect(roll.rgb.every((v) => Number(v.toFixed(6)) === v)).toBe(true);
    expect(roll).toEqual(medianOfFrameBases(frames));
  });

  it('counts neither frames with a drawn rectangle nor frames that found no base', () => {
    const only = measured([0.8, 0.7, 0.6], 0.9);
    const frames = [
      { mode: 'region' as const, measured: measured([0.1, 0.1, 0.1], 1) },
      { mode: 'auto' as const, measured: null },
      { mode: 'auto' as const, measured: measured([0.3, 0.3, 0.3], 0) },
      { mode: 'auto' as const, measured: only },
    ];
    expect(medianOfFrameBases(frames)).toEqual({ rgb: only.rgb, region: null, confidence: 0.9 });
  });

  it('is null when no frame found a base', () => {
    expect(rollFilmBase({ mode: 'auto', measured: null }, [{ mode: 'auto', measured: null }])).toBeNull();
    expect(medianOfFrameBases([])).toBeNull();
  });
});
