import type { FrameReviewRequest, FrameReviewResult, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { findFrameById } from '../frames/frame-repository';
import { loadFrameFor } from '../frames/frame-access';
import { loadFileRelease } from '../downloads/load-file-release';
import { readyPaymentBlocker } from '../downloads/ready-payment-blocker';
import { moveOrder } from '../orders/move-order';
import { findOrderById } from '../orders/order-repository';
import { findRollById } from '../rolls/roll-repository';
import { framesWithReviews } from './frames-with-reviews';
import { orderStatusAfterReview } from './order-status-after-review';
import { decisionsByRollOfOrder, findReviewOfFrame, upsertReview } from './review-repository';
import { isRollApproved } from './roll-approval';

export interface ReviewDeps {
  db: Kysely<Database>;
  clock: Clock;
}

/**
 * The operator's review of rendered frames: each decision is stored, audited, and moves the order on when it
 * settles the last roll (or takes a ready order back when it unsettles one), all in one transaction.
 * @example const review = createReviewService({ db, clock }); await review.decide(operator, 12, { decision: 'approved', note: '' });
 */
export function createReviewService({ db, clock }: ReviewDeps) {
  return {
    /**
     * Records an operator's decision on a frame. Throws AppError 404 (frame-not-found) for a frame the actor may
     * not see and 409 (frame-not-rendered) when approving a frame that is not rendered yet. Returns the frame with
     * its review and whether its roll is now approved.
     */
    async decide(actor: User, frameId: number, request: FrameReviewRequest): Promise<FrameReviewResult> {
      const rollApproved = await db.transaction().execute(async (trx) => {
        const frame = await loadFrameFor(trx, frameId, actor);
        if (request.decision === 'approved' && frame.status !== 'done') {
          throw new AppError(
            'frame-not-rendered',
            409,
            `Frame ${frame.id} is ${frame.status}; approve it once it is rendered.`,
          );
        }
        const at = clock.now();
        const before = await findReviewOfFrame(trx, frame.id);
        await upsertReview(trx, {
          frame_id: frame.id,
          decision: request.decision,
          note: request.note,
          reviewed_by: actor.id,
          reviewed_at: at.toISOString(),
        });
        await recordAudit(trx, {
          at,
          actor: { id: actor.id, email: actor.email },
          action: 'frame-reviewed',
          target: `frame:${frame.id}`,
          details: {
            before: before ? { decision: before.decision, note: before.note } : null,
            after: { decision: request.decision, note: request.note },
          },
        });
        const roll = (await findRollById(trx, frame.roll_id))!;
        const order = (await findOrderById(trx, roll.order_id))!;
        const rolls = await decisionsByRollOfOrder(trx, order.id);
        const everyRollApproved = [...rolls.values()].every(isRollApproved);
        const paymentLetsReady =
          everyRollApproved && readyPaymentBlocker((await loadFileRelease(trx, order)).state) === null;
        const next = orderStatusAfterReview(order.status, everyRollApproved, paymentLetsReady);
        if (next) {
          await moveOrder(trx, {
            orderId: order.id,
            from: order.status,
            to: next,
            actor,
            at,
            details: { because: `frame:${frame.id} reviewed` },
          });
        }
        return isRollApproved(rolls.get(roll.id) ?? []);
      });
      const [frame] = await framesWithReviews(db, [(await findFrameById(db, frameId))!]);
      return { frame: frame!, rollApproved };
    },
  };
}

export type ReviewService = ReturnType<typeof createReviewService>;
