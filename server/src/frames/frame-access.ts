import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { isStaff, ownerOfRoll } from '../orders/order-access';
import type { FrameRow } from '../orders/order-tables';
import { findFrameById } from './frame-repository';

/** The 404 of a frame that is missing or not this user's to see. */
export const frameNotFound = (id: number) => new AppError('frame-not-found', 404, `No frame with id ${id}.`);

/**
 * The frame if this user may see it: staff see every frame, a customer only those of their own orders; another
 * customer's frame answers the same 404 as a missing one.
 *
 * @example const frame = await loadFrameFor(db, params.id, user!);
 */
export async function loadFrameFor(db: Kysely<Database>, id: number, user: User): Promise<FrameRow> {
  const frame = await findFrameById(db, id);
  if (!frame) throw frameNotFound(id);
  if (!isStaff(user) && (await ownerOfRoll(db, frame.roll_id)) !== user.id) throw frameNotFound(id);
  return frame;
}
