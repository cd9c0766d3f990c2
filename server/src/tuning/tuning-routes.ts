import { idParamsSchema, staffRoles, type ProfileDocument } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { listFramesOfRoll } from '../frames/frame-repository';
import type { RouteModule } from '../http/route-module';
import { framesWithReviews } from '../review/frames-with-reviews';
import { isRollApproved } from '../review/roll-approval';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { toRoll, type RollListRow } from '../rolls/roll-repository';

async function profileOf(db: Kysely<Database>, roll: RollListRow): Promise<ProfileDocument> {
  const version = await db
    .selectFrom('profile_versions')
    .select('parameters')
    .where('id', '=', roll.profile_version_id)
    .executeTakeFirstOrThrow();
  return JSON.parse(version.parameters) as ProfileDocument;
}

/**
 * The tuning screen's server side: a roll's tuning sheet. A frame's working negative for the live preview is in
 * `frames/`, frame reviews are in `review/`.
 */
export const tuningRoutes: RouteModule = (api, { db }) => {
  api.define(
    {
      method: 'get',
      path: '/api/rolls/:id/tuning',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'A roll’s tuning sheet: pinned profile, scanner, roll and frames with their reviews',
    },
    async (_req, res, { params, user }) => {
      const roll = await loadRollFor(db, params.id, user!);
      const frames = await listFramesOfRoll(db, roll.id);
      const list = await framesWithReviews(db, frames);
      res.json({
        roll: toRoll(roll),
        profile: await profileOf(db, roll),
        scanner: await scannerProfileOf(db, roll.scanner_id),
        frames: list,
        approved: isRollApproved(list.map((f) => f.review?.decision ?? null)),
      });
    },
  );
};
