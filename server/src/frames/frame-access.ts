import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { isStaff, ownerOfRoll } from '../orders/order-access';
import type { FrameRow } from './frame-tables';
import { findReviewOfFrame, reviewsOfFrames } from '../review/review-repository';
import { findFrameById } from './frame-repository';

/** The 404 of a frame that is missing or not this user's to see. */
export const frameNotFound = (id: number) => new AppError('frame-not-found', 404, `No frame with id ${id}.`);

/**
 * The frame if this user may see it: staff see every frame; a customer only the frames of their own orders that the
 * lab approved for delivery (as customerFileAccess serves their files). Another customer's frame, and one excluded,
 * rejected or not reviewed yet, answer the same 404 as a missing one.
 *
 * @example const frame = await loadFrameFor(db, params.id, user!);
 */
export async function loadFrameFor(db: Kysely<Database>, id: number, user: User): Promise<FrameRow> {
  const frame = await findFrameById(db, id);
  if (!frame) throw frameNotFound(id);
  if (isStaff(user)) return frame;
  if ((await ownerOfRoll(db, frame.roll_id)) !== user.id) throw frameNotFound(id);
  if ((await findReviewOfFrame(db, frame.id))?.decision !== 'approved') throw frameNotFound(id);
  return frame;
}

/**
 * The frames of a roll this user may see, in their order: all of them for staff, the approved ones for a customer
 * (the roll itself the caller has already checked).
 */
export async function visibleFramesFor<F extends { id: number }>(
  db: Kysely<Database>,
  frames: readonly F[],
  user: User,
): Promise<F[]> {
  if (isStaff(user)) return [...frames];
  const reviews = await reviewsOfFrames(
    db,
    frames.map((f) => f.id),
  );
  return frames.filter((f) => reviews.get(f.id)?.decision === 'approved');
}
