import type { ReviewDecision, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { isStaff } from '../orders/order-access';
import { findOrderById } from '../orders/order-repository';
import { customerFileAccess, type CustomerFileKind } from './customer-file-access';
import { loadFileRelease } from './load-file-release';

/** What is asked for: one frame's file, or the order's files as a whole (a download link, the zip). */
export type CustomerFileTarget =
  { frameId: number; kind: CustomerFileKind } | { orderId: number; kind: 'full-size' };

/** The order and review decision of a frame. */
async function frameOrderAndDecision(db: Kysely<Database>, frameId: number) {
  return db
    .selectFrom('frames')
    .innerJoin('rolls', 'rolls.id', 'frames.roll_id')
    .leftJoin('frame_reviews', 'frame_reviews.frame_id', 'frames.id')
    .select(['rolls.order_id', 'frame_reviews.decision'])
    .where('frames.id', '=', frameId)
    .executeTakeFirst();
}

/**
 * Applies customerFileAccess to a request for files, for every route that serves a customer a file. Staff pass
 * always. A frame not for customers answers 404 `frame-not-found`, as if it did not exist; files not released yet
 * answer 409 `scans-not-released`, saying why and what is left to pay. Call it after the ownership check.
 *
 * @example
 * await assertCustomerMayGet(db, user, { frameId: frame.id, kind: 'full-size' });
 */
export async function assertCustomerMayGet(
  db: Kysely<Database>,
  user: User,
  target: CustomerFileTarget,
): Promise<void> {
  if (isStaff(user)) return;
  let orderId: number;
  let decision: ReviewDecision | null;
  if ('frameId' in target) {
    const found = await frameOrderAndDecision(db, target.frameId);
    if (!found) throw new AppError('frame-not-found', 404, `No frame with id ${target.frameId}.`);
    orderId = found.order_id;
    decision = found.decision;
  } else {
    orderId = target.orderId;
    // the order as a whole: each frame is checked again when the zip is made
    decision = 'approved';
  }
  const order = await findOrderById(db, orderId);
  if (!order) throw new AppError('order-not-found', 404, `No order with id ${orderId}.`);
  const { state } = await loadFileRelease(db, order);
  const access = customerFileAccess(state, decision, target.kind);
  if (access.allowed) return;
  if (access.refusal === 'hidden') {
    throw new AppError(
      'frame-not-found',
      404,
      'frameId' in target ? `No frame with id ${target.frameId}.` : 'No such frame.',
    );
  }
  throw new AppError('scans-not-released', 409, access.reason);
}
