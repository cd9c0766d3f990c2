import type { ReviewDecision } from '@clearbase/contracts';
import type { Selectable } from 'kysely';

/** An operator's latest decision on a rendered frame. */
export interface FrameReviewsTable {
  frame_id: number;
  decision: ReviewDecision;
  note: string;
  reviewed_by: number;
  reviewed_at: string;
}

export type FrameReviewRow = Selectable<FrameReviewsTable>;
