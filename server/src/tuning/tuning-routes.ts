import {
  frameReviewRequestSchema,
  idParamsSchema,
  staffRoles,
  workingNegativeHeaders,
  workingNegativeLongEdge,
  type FrameReview,
  type MeasuredBase,
  type PixelRegion,
  type ProfileDocument,
  type TuningFrame,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit, type AuditAction } from '../audit/audit-log';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import { frameSourceFile } from '../frames/frame-negative';
import { findFrameById, listFramesOfRoll, outputFormatsOfFrames, toFrame } from '../frames/frame-repository';
import { loadFrameFor } from '../frames/frames-routes';
import type { RouteModule } from '../http/route-module';
import { sendRawPixels } from '../http/send-raw-pixels';
import { readNegative } from '../imaging/index';
import { chooseBase } from '../jobs/job-runner';
import { findOrderById, setOrderStatus } from '../orders/order-repository';
import type { FrameRow } from '../orders/order-tables';
import { medianBaseOf } from '../rolls/median-base';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { findRollById, listRollsOfOrder, toRoll, type RollListRow } from '../rolls/roll-repository';
import type { FrameReviewRow } from './frame-reviews-table';
import { workingNegativeCacheOf } from './working-negative-cache';
import { measureBaseOffThread, measureLevelsOffThread } from './working-negative-worker';

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

/** Reviews of these frames with the reviewer's name, by frame id. */
async function reviewsOf(db: Kysely<Database>, frameIds: number[]): Promise<Map<number, FrameReview>> {
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

async function tuningFrames(db: Kysely<Database>, rows: FrameRow[]): Promise<TuningFrame[]> {
  const ids = rows.map((f) => f.id);
  const [outputs, reviews] = await Promise.all([outputFormatsOfFrames(db, ids), reviewsOf(db, ids)]);
  return rows.map((f) => ({ ...toFrame(f, outputs.get(f.id)), review: reviews.get(f.id) ?? null }));
}

/** A roll is approved when it has frames and every one is approved or excluded. */
async function rollApproved(db: Kysely<Database>, rollId: number): Promise<boolean> {
  const frames = await listFramesOfRoll(db, rollId);
  if (frames.length === 0) return false;
  const reviews = await reviewsOf(
    db,
    frames.map((f) => f.id),
  );
  return frames.every((f) => {
    const d = reviews.get(f.id)?.decision;
    return d === 'approved' || d === 'excluded';
  });
}

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
 * once per scan and kept in the file store; no pixel loop runs on the event loop), and
 * frame reviews, which approve the roll when every frame is approved or excluded (the order becomes ready when all
 * its rolls are, and goes back to tuning when one is not).
 */
export const tuningRoutes: RouteModule = (api, { db, config, clock }) => {
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
      const list = await tuningFrames(db, frames);
      res.json({
        roll: toRoll(roll),
        profile: await profileOf(db, roll),
        scanner: await scannerProfileOf(db, roll.scanner_id),
        frames: list,
        approved:
          list.length > 0 &&
          list.every((f) => f.review?.decision === 'approved' || f.review?.decision === 'excluded'),
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

  api.define(
    {
      method: 'post',
      path: '/api/frames/:id/qc',
      roles: staffRoles,
      params: idParamsSchema,
      body: frameReviewRequestSchema,
      summary: 'Approve, reject (with a note) or exclude a frame',
    },
    async (_req, res, { params, body, user }) => {
      const frame = await loadFrameFor(db, params.id, user!);
      if (body.decision === 'approved' && frame.status !== 'done') {
        throw new AppError(
          'frame-not-rendered',
          409,
          `Frame ${frame.id} is ${frame.status}; approve it once it is rendered.`,
        );
      }
      const roll = (await findRollById(db, frame.roll_id))!;
      const approved = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const before = await trx
          .selectFrom('frame_reviews')
          .selectAll()
          .where('frame_id', '=', frame.id)
          .executeTakeFirst();
        const row: FrameReviewRow = {
          frame_id: frame.id,
          decision: body.decision,
          note: body.note,
          reviewed_by: user!.id,
          reviewed_at: at.toISOString(),
        };
        await trx
          .insertInto('frame_reviews')
          .values(row)
          .onConflict((oc) => oc.column('frame_id').doUpdateSet({ ...row }))
          .execute();
        await recordAudit(trx, {
          at,
          actor: { id: user!.id, email: user!.email },
          action: 'frame-reviewed' as string as AuditAction,
          target: `frame:${frame.id}`,
          details: {
            before: before ? { decision: before.decision, note: before.note } : null,
            after: { decision: body.decision, note: body.note },
          },
        });
        const rollDone = await rollApproved(trx, roll.id);
        const order = (await findOrderById(trx, roll.order_id))!;
        const rolls = await listRollsOfOrder(trx, order.id);
        let allDone = rollDone;
        for (const r of rolls) if (allDone && r.id !== roll.id) allDone = await rollApproved(trx, r.id);
        const next = allDone
          ? order.status === 'scanning' || order.status === 'tuning' || order.status === 'developing'
            ? 'ready'
            : null
          : order.status === 'ready'
            ? 'tuning'
            : null;
        if (next) {
          await setOrderStatus(trx, order.id, next, at);
          await recordAudit(trx, {
            at,
            actor: { id: user!.id, email: user!.email },
            action: 'order-status-changed' as string as AuditAction,
            target: `order:${order.id}`,
            details: { before: order.status, after: next, because: `frame:${frame.id} reviewed` },
          });
        }
        return rollDone;
      });
      const [reviewed] = await tuningFrames(db, [(await findFrameById(db, frame.id))!]);
      res.json({ frame: reviewed, rollApproved: approved });
    },
  );
};
