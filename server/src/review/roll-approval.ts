import type { ReviewDecision } from '@clearbase/contracts';

/** Where one frame stands in its roll's review: the operator's latest decision, or null while nobody has decided. */
export type FrameDecision = ReviewDecision | null;

/** A frame no longer holds its roll back once it is approved, or excluded from delivery. */
const settled = (decision: FrameDecision): boolean => decision === 'approved' || decision === 'excluded';

/**
 * Why a roll is not approved yet, in words that follow "Roll 2 …": it has no frames, or some of its frames are
 * neither approved nor excluded. Null when the roll is approved.
 * @example whyRollNotApproved(['approved', null, 'rejected']) // 'has 2 frames not approved'
 */
export function whyRollNotApproved(decisions: readonly FrameDecision[]): string | null {
  if (decisions.length === 0) return 'has no scans yet';
  const open = decisions.filter((d) => !settled(d)).length;
  return open === 0 ? null : `has ${open} frame${open === 1 ? '' : 's'} not approved`;
}

/**
 * A roll is approved when it has frames and every one of them is approved or excluded.
 * @example isRollApproved(['approved', 'excluded']) // true
 */
export function isRollApproved(decisions: readonly FrameDecision[]): boolean {
  return whyRollNotApproved(decisions) === null;
}
