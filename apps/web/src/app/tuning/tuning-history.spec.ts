import type { Adjustments } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { HISTORY_LIMIT, historyReducer, startHistory, type TuningHistory } from './tuning-history';

const zero: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};
const green = (n: number): Adjustments => ({ ...zero, balance: { ...zero.balance, magentaGreen: n } });
const start = () => startHistory({ roll: zero, frames: { 1: zero, 2: zero, 3: zero } });

describe('tuning history', () => {
  it('undoes and redoes frame and roll changes step by step', () => {
    let h: TuningHistory = start();
    h = historyReducer(h, { type: 'set', target: { kind: 'frame', frameId: 1 }, adjustments: green(4) });
    h = historyReducer(h, { type: 'set', target: { kind: 'roll' }, adjustments: green(-2) });
    expect(h.present.frames[1]).toEqual(green(4));
    expect(h.present.roll).toEqual(green(-2));
    h = historyReducer(h, { type: 'undo' });
    expect(h.present.roll).toEqual(zero);
    expect(h.present.frames[1]).toEqual(green(4));
    h = historyReducer(h, { type: 'undo' });
    expect(h.present.frames[1]).toEqual(zero);
    expect(historyReducer(h, { type: 'undo' })).toBe(h);
    h = historyReducer(h, { type: 'redo' });
    h = historyReducer(h, { type: 'redo' });
    expect(h.present.roll).toEqual(green(-2));
    expect(historyReducer(h, { type: 'redo' })).toBe(h);
  });

  it('drops what was undone when a new change comes', () => {
    let h = historyReducer(start(), { type: 'set', target: { kind: 'roll' }, adjustments: green(1) });
    h = historyReducer(h, { type: 'undo' });
    h = historyReducer(h, { type: 'set', target: { kind: 'roll' }, adjustments: green(7) });
    expect(h.future).toEqual([]);
    expect(h.present.roll).toEqual(green(7));
  });

  it('copies one frame’s adjustments to the selected frames as one step', () => {
    let h = historyReducer(start(), { type: 'copy', from: green(5), frameIds: [2, 3] });
    expect(h.present.frames).toEqual({ 1: zero, 2: green(5), 3: green(5) });
    h = historyReducer(h, { type: 'undo' });
    expect(h.present.frames).toEqual({ 1: zero, 2: zero, 3: zero });
    expect(historyReducer(h, { type: 'copy', from: green(5), frameIds: [] })).toBe(h);
  });

  it('keeps no step for a change to the same values, and at most the limit of steps', () => {
    const h = start();
    expect(historyReducer(h, { type: 'set', target: { kind: 'roll' }, adjustments: zero })).toBe(h);
    let long = h;
    for (let i = 1; i <= HISTORY_LIMIT + 10; i++)
      long = historyReducer(long, { type: 'set', target: { kind: 'roll' }, adjustments: green(i) });
    expect(long.past).toHaveLength(HISTORY_LIMIT);
  });

  it('starts over from a saved state on reset', () => {
    const h = historyReducer(start(), { type: 'set', target: { kind: 'roll' }, adjustments: green(1) });
    const saved = { roll: green(1), frames: {} };
    expect(historyReducer(h, { type: 'reset', state: saved })).toEqual({
      past: [],
      present: saved,
      future: [],
    });
  });
});
