import type { FrameReview } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { FrameReviewRow } from './frame-reviews-table';
import type { FrameDecision } from './roll-approval';

/** Reviews of these frames with the reviewer's name, by frame id; frames nobody reviewed are left out. */
export async function reviewsOfFrames(
  db: Kysely<Database>,
  frameIds: readonly number[],
): Promise<Map<number, FrameReview>> {
  if (frameIds.length === 0) return new Map();
  const rows = await db
    .selectFrom('frame_reviews')
    .innerJoin('users', 'users.id', 'frame_reviews.reviewed_by')
    .select([
      'frame_reviews.frame_id',
      'frame_reviews.decision',
      'frame_reviews.note',
      'frame_reviews.reviewed_at',
      'users.name as reviewer',
    ])
    .where('frame_reviews.frame_id', 'in', frameIds)
    .execute();
  return new Map(
    rows.map((r) => [
      r.frame_id,
      { decision: r.decision, note: r.note, reviewedBy: r.reviewer, reviewedAt: r.reviewed_at },
    ]),
  );
}

export function findReviewOfFrame(
  db: Kysely<Database>,
  frameId: number,
): Promise<FrameReviewRow | undefined> {
  return db.selectFrom('frame_reviews').selectAll().where('frame_id', '=', frameId).executeTakeFirst();
}

/** Stores a frame's latest review, replacing the one before. */
export async function upsertReview(db: Kysely<Database>, row: FrameReviewRow): Promise<void> {
  await db
    .insertInto('frame_reviews')
    .values(row)
    .onConflict((oc) => oc.column('frame_id').doUpdateSet({ ...row }))
    .execute();
}

/** Each roll of the order with its frames' decisions (null where nobody decided), rolls and frames in id order. */
export async function decisionsByRollOfOrder(
  db: Kysely<Database>,
  orderId: number,
): Promise<Map<number, FrameDecision[]>> {
  const rows = await db
    .selectFrom('rolls')
    .leftJoin('frames', 'frames.roll_id', 'rolls.id')
    .leftJoin('frame_reviews', 'frame_reviews.frame_id', 'frames.id')
    .select(['rolls.id as roll_id', 'frames.id as frame_id', 'frame_reviews.decision'])
    .where('rolls.order_id', '=', orderId)
    .orderBy('rolls.id')
    .orderBy('frames.id')
    .execute();
  const byRoll = new Map<number, FrameDecision[]>();
  for (const row of rows) {
    const decisions = byRoll.get(row.roll_id) ?? [];
    if (row.frame_id !== null) decisions.push(row.decision ?? null);
    byRoll.set(row.roll_id, decisions);
  }
  return byRoll;
}
