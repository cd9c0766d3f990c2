import { describe, expect, it } from 'vitest';
import { isRollApproved, whyRollNotApproved } from './roll-approval';

describe('roll approval', () => {
  it('approves a roll whose every frame is approved or excluded', () => {
    expect(isRollApproved(['approved', 'excluded', 'approved'])).toBe(true);
    expect(whyRollNotApproved(['approved', 'excluded'])).toBeNull();
  });

  it('does not approve a roll with no frames, and says it has no scans yet', () => {
    expect(isRollApproved([])).toBe(false);
    expect(whyRollNotApproved([])).toBe('has no scans yet');
  });

  it('holds a roll back while a frame is rejected or not reviewed, counting those frames', () => {
    expect(isRollApproved(['approved', 'rejected'])).toBe(false);
    expect(whyRollNotApproved(['approved', 'rejected'])).toBe('has 1 frame not approved');
    expect(whyRollNotApproved([null, 'rejected', 'excluded'])).toBe('has 2 frames not approved');
  });

  it('approves a roll whose frames are all excluded, since excluded frames are not delivered', () => {
    expect(isRollApproved(['excluded'])).toBe(true);
  });
});
