import { describe, expect, it } from 'vitest';
import { TINTLINE_400 } from '../forward-model';
import { LINEAR_SCANNER } from '../scanner-input';
import { calibrationRoll } from './calibration-roll';

describe('calibrationRoll', () => {
  it('makes grey frames of the asked width and height, with the grey rectangle in their central half', () => {
    const roll = calibrationRoll({
      stock: TINTLINE_400,
      scanner: LINEAR_SCANNER,
      stops: [-1, 0, 1],
      greySize: 90,
      greyHeight: 48,
      rebate: 6,
    });
    expect(roll.brackets.map((b) => [b.negative.width, b.negative.height])).toEqual([
      [90, 60],
      [90, 60],
      [90, 60],
    ]);
    expect(roll.greyRegion).toEqual([23, 18, 44, 24]);
    expect(roll.leader).toBeUndefined();
  });

  it('adds a leader frame of film base and fog only when asked', () => {
    const roll = calibrationRoll({
      stock: TINTLINE_400,
      scanner: LINEAR_SCANNER,
      stops: [0, 1],
      greySize: 30,
      grain: 0,
      leader: true,
    });
    const leader = roll.leader!;
    expect([leader.width, leader.height]).toEqual([30, 42]);
    const centre = (Math.floor(leader.height / 2) * leader.width + 15) * 3;
    const rebate = 3 * 3;
    // the leader's middle is as clear as its rebate, to within the model's toe at its floor
    for (let c = 0; c < 3; c++)
      expect(Math.abs(leader.data[centre + c]! - leader.data[rebate + c]!)).toBeLessThan(
        leader.data[rebate + c]! * 0.001,
      );
  });
});
