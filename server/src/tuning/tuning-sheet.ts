import type { ProfileDocument, RollTuning, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { listFramesOfRoll } from '../frames/frame-repository';
import { findVersionById } from '../profiles/profile-repository';
import { framesWithReviews } from '../review/frames-with-reviews';
import { isRollApproved } from '../review/roll-approval';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { toRoll } from '../rolls/roll-repository';

/**
 * A roll's tuning sheet: the roll, the profile version it is pinned to, its scanner's input profile, its frames with
 * their reviews, and whether the roll is approved.
 *
 * @example
 * const sheet = await tuningSheet(db, 12, operator);
 */
export async function tuningSheet(db: Kysely<Database>, rollId: number, actor: User): Promise<RollTuning> {
  const roll = await loadRollFor(db, rollId, actor);
  const version = await findVersionById(db, roll.profile_version_id);
  if (!version)
    throw new Error(`roll ${roll.id} is pinned to profile version ${roll.profile_version_id}, which is gone`);
  const frames = await framesWithReviews(db, await listFramesOfRoll(db, roll.id));
  return {
    roll: toRoll(roll),
    profile: JSON.parse(version.parameters) as ProfileDocument,
    scanner: await scannerProfileOf(db, roll.scanner_id),
    frames,
    approved: isRollApproved(frames.map((f) => f.review?.decision ?? null)),
  };
}
