import {
  idParamsSchema,
  staffRoles,
  workingNegativeHeaders,
  workingNegativeLongEdge,
  type MeasuredBase,
  type PixelRegion,
  type ProfileDocument,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import { frameSourceFile } from '../frames/frame-negative';
import { listFramesOfRoll } from '../frames/frame-repository';
import { loadFrameFor } from '../frames/frames-routes';
import type { RouteModule } from '../http/route-module';
import { sendRawPixels } from '../http/send-raw-pixels';
import { readNegative } from '../imaging/index';
import { chooseBase } from '../jobs/job-runner';
import type { FrameRow } from '../orders/order-tables';
import { framesWithReviews } from '../review/frames-with-reviews';
import { isRollApproved } from '../review/roll-approval';
import { medianBaseOf } from '../rolls/median-base';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { findRollById, toRoll, type RollListRow } from '../rolls/roll-repository';
import { workingNegativeCacheOf } from './working-negative-cache';
import { measureBaseOffThread, measureLevelsOffThread } from './working-negative-worker';

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

/** The roll base a frame falls back on: drawn on the roll, else the median of its frames' own bases. */
function rollBaseOf(roll: RollListRow, frames: FrameRow[]): MeasuredBase | null {
  return roll.base_mode === 'region' ? parse<MeasuredBase>(roll.base_measured) : medianBaseOf(frames);
}

async function profileOf(db: Kysely<Database>, roll: RollListRow): Promise<ProfileDocument> {
  const version = await db
    .selectFrom('profile_versions')
    .select('parameters')
    .where('id', '=', roll.profile_version_id)
    .executeTakeFirstOrThrow();
  return JSON.parse(version.parameters) as ProfileDocument;
}

/**
 * The tuning screen's server side: a roll's tuning sheet, each frame's working negative for the live preview (made
 * once per scan and kept in the file store; no pixel loop runs on the event loop). Frame reviews are in `review/`.
 */
export const tuningRoutes: RouteModule = (api, { db, config }) => {
  const store = createFileStore(config.dataDir);
  const workingNegatives = workingNegativeCacheOf(store);

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

  api.define(
    {
      method: 'get',
      path: '/api/frames/:id/working-negative',
      roles: staffRoles,
      params: idParamsSchema,
      summary:
        'The frame’s negative reduced to a long edge of 1500, raw 16-bit RGB, with its base and levels',
    },
    async (_req, res, { params, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      const roll = (await findRollById(db, frame.roll_id))!;
      const scanner = await scannerProfileOf(db, roll.scanner_id);
      const source = await frameSourceFile(db, store, frame);
      const { maxPixels } = config.uploads;
      const working = await workingNegatives.get(source, workingNegativeLongEdge, maxPixels);
      let own = frame.base_measured;
      if (own === null) {
        // a frame whose base was not measured on upload: its full scan is measured now, off the event loop
        const image = await readNegative(source.path, { maxPixels });
        const region = parse<PixelRegion>(frame.base_region);
        own = await measureBaseOffThread({ kind: 'base', image, scanner, region }).then(
          (base) => JSON.stringify(base),
          () => null,
        );
      }
      let chosen: ReturnType<typeof chooseBase>;
      try {
        chosen = chooseBase(
          { ...frame, base_measured: own },
          rollBaseOf(roll, await listFramesOfRoll(db, roll.id)),
        );
      } catch (err) {
        throw new AppError('no-base', 422, err instanceof Error ? err.message : 'No usable film base.');
      }
      const levels = await measureLevelsOffThread({
        kind: 'levels',
        sample: working.sample,
        profile: await profileOf(db, roll),
        scanner,
        base: chosen.base.rgb,
      });
      sendRawPixels(res, {
        pixels: working.pixels,
        cacheControl: 'private, no-cache',
        headers: {
          [workingNegativeHeaders.width]: String(working.width),
          [workingNegativeHeaders.height]: String(working.height),
          [workingNegativeHeaders.base]: chosen.base.rgb.map((b) => b.toPrecision(9)).join(','),
          [workingNegativeHeaders.baseSource]: chosen.source,
          [workingNegativeHeaders.scanSize]: `${working.scanWidth}x${working.scanHeight}`,
          [workingNegativeHeaders.levels]: JSON.stringify(levels),
        },
      });
    },
  );
};
