import { z } from 'zod';
import { frameSchema } from '../orders/frame';
import { rollSchema } from '../orders/roll';
import { profileDocumentSchema, scannerProfileSchema } from '../profiles/profile-document';

/** What an operator decided about a rendered frame. `excluded`: not delivered (blank, fogged leader, double). */
export const reviewDecisions = ['approved', 'rejected', 'excluded'] as const;
export const reviewDecisionSchema = z.enum(reviewDecisions);
export type ReviewDecision = z.infer<typeof reviewDecisionSchema>;

/** An operator's review of one frame; a rejection says why. */
export const frameReviewRequestSchema = z
  .strictObject({
    decision: reviewDecisionSchema,
    // 500 characters hold a few sentences for the next operator: our choice
    note: z.string().trim().max(500, 'Keep the note under 500 characters').default(''),
  })
  .refine((r) => r.decision !== 'rejected' || r.note.length > 0, {
    path: ['note'],
    message: 'Say what is wrong with a rejected frame',
  });
export type FrameReviewRequest = z.infer<typeof frameReviewRequestSchema>;

/** A stored review. */
export const frameReviewSchema = z.object({
  decision: reviewDecisionSchema,
  note: z.string(),
  reviewedBy: z.string(),
  reviewedAt: z.string(),
});
export type FrameReview = z.infer<typeof frameReviewSchema>;

/** A frame as the tuning screen sees it: the frame and its review. */
export const tuningFrameSchema = frameSchema.extend({ review: frameReviewSchema.nullable() });
export type TuningFrame = z.infer<typeof tuningFrameSchema>;

/**
 * Everything the tuning screen needs to render a roll's frames as the server does: the pinned profile version's
 * document, the scanner's input profile, the roll (its base and adjustments) and each frame with its review.
 * `approved` is true when every frame is approved or excluded.
 */
export const rollTuningSchema = z.object({
  roll: rollSchema,
  profile: profileDocumentSchema,
  scanner: scannerProfileSchema,
  frames: z.array(tuningFrameSchema),
  approved: z.boolean(),
});
export type RollTuning = z.infer<typeof rollTuningSchema>;

/** The answer to a frame review: the frame, and whether its roll is now approved. */
export const frameReviewResultSchema = z.object({
  frame: tuningFrameSchema,
  rollApproved: z.boolean(),
});
export type FrameReviewResult = z.infer<typeof frameReviewResultSchema>;

/** Long edge of a working negative, pixels: about 1.5 megapixels at 3:2, light to send and render live (our choice). */
export const workingNegativeLongEdge = 1500;
