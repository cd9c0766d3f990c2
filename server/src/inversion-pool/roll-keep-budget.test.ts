import { describe, expect, it } from 'vitest';
import { mayKeepFrame, rollKeepBudget, ROLL_KEEP_FLOOR_BYTES } from './roll-keep-budget';

const MB = 1024 * 1024;
// 6000 × 4000 pixels, three 16-bit samples each.
const FRAME_24MP = 6000 * 4000 * 3 * 2;

describe('roll keep budget', () => {
  it('keeps a quarter of the free memory, never less than the floor', () => {
    expect(rollKeepBudget(8192 * MB)).toBe(2048 * MB);
    expect(rollKeepBudget(512 * MB)).toBe(ROLL_KEEP_FLOOR_BYTES);
    expect(rollKeepBudget(Number.NaN)).toBe(ROLL_KEEP_FLOOR_BYTES);
  });
  it('keeps all 36 frames of 24 MP on a machine with 22 GB free', () => {
    let kept = 0;
    let free = 22 * 1024 * MB;
    for (let frame = 0; frame < 36; frame++) {
      expect(mayKeepFrame(FRAME_24MP, kept, free)).toBe(true);
      kept += FRAME_24MP;
      free -= FRAME_24MP;
    }
  });
  it('keeps only one 24 MP frame when little memory is free', () => {
    expect(mayKeepFrame(FRAME_24MP, 0, 600 * MB)).toBe(true);
    expect(mayKeepFrame(FRAME_24MP, FRAME_24MP, 600 * MB - FRAME_24MP)).toBe(false);
  });
  it('stops keeping when other programs take the memory the roll counted on', () => {
    expect(mayKeepFrame(FRAME_24MP, 10 * FRAME_24MP, 8192 * MB)).toBe(true);
    expect(mayKeepFrame(FRAME_24MP, 10 * FRAME_24MP, 1024 * MB)).toBe(false);
  });
});
