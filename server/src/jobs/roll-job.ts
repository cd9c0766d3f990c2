import {
  readStoredAdjustments,
  scanSizeLongEdge,
  type Adjustments,
  type MeasuredBase,
  type OutputFormat,
  type ProfileDocument,
  type ScannerProfile,
  type ScanSize,
} from '@clearbase/contracts';
import { rollLevels, type FrameLevels } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import type PQueue from 'p-queue';
import type { Logger } from 'pino';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import type { FilmBaseService } from '../film-base/film-base-service';
import { recordFile } from '../files/file-repository';
import type { FileStore } from '../files/file-store';
import { frameSourcePath } from '../frames/frame-negative';
import {
  listFramesOfRoll,
  markFrameDone,
  markFrameInverting,
  markFrameTryFailed,
  putFrameOutput,
  toFrame,
} from '../frames/frame-repository';
import { readNegative } from '../imaging/index';
import type { InversionPool } from '../inversion-pool/inversion-pool';
import { measureLevels } from '../inversion-pool/invert-negative-file';
import { advanceOrderWithWork } from '../orders/advance-order-with-work';
import { findOrderById } from '../orders/order-repository';
import type { FrameRow } from '../frames/frame-tables';
import type { JobRow } from './job-tables';
import { findVersionById } from '../profiles/profile-repository';
import { scannerProfileOf } from '../rolls/roll-access';
import { findRollById, setRollStatus, type RollListRow } from '../rolls/roll-repository';
import { countFrameOfJob, findJobById, rollIdOfTarget } from './job-repository';
import { meteredLevels } from './metered-levels';
import { renderFrame } from './render-frame';
import { publishRollEvent } from './roll-events';

/** Tries per frame before it is marked failed with its last error (three: the product's rule). */
export const maxFrameAttempts = 3;

export interface RollJobDeps {
  db: Kysely<Database>;
  config: { uploads: { maxPixels: number } };
  clock: Clock;
  logger: Logger;
  store: FileStore;
  filmBase: FilmBaseService;
  /** The queue frames are rendered on, as many at a time as the server's job concurrency. */
  frames: PQueue;
  /** The worker pool, started on first use. */
  pool: () => InversionPool;
  /** True once the server is shutting down: no new frame is started. */
  stopping: () => boolean;
  publishJob: (row: JobRow) => void;
  afterFrame?: (frameId: number) => void | Promise<void>;
}

/** Everything a roll's frames render with, read once per job. */
interface RollContext {
  profile: ProfileDocument;
  scanner: ScannerProfile;
  adjustments: Adjustments;
  rollBase: MeasuredBase | null;
  formats: OutputFormat[];
  longEdge: number | null;
  /** Roll-wide levels, or the metered exposure's, when the job asked for them. */
  levels?: FrameLevels;
  levelsSource?: 'roll' | 'metered';
}

/** A frame that has no base to render with: it fails at once, flagged `no-base`, without more tries. */
class NoBaseError extends Error {}

/**
 * What rendering a roll means: every frame not yet done is rendered against the base `filmBase` chooses for it, with
 * the roll's pinned profile, its scanner, the roll's and the frame's adjustments, the order's formats and size, and
 * optionally the whole roll's levels. A frame's files are flushed and renamed into the store before one transaction
 * records its outputs, marks it done and counts it, so a process killed at any moment leaves every frame either done
 * with all its outputs or still to do. A frame is tried `maxFrameAttempts` times; cancelling and stopping take effect
 * between tries.
 *
 * @example const rollJob = createRollJob(deps); const roll = await rollJob.render(job); await rollJob.finished(roll, at);
 */
export function createRollJob(deps: RollJobDeps) {
  const { db, config, clock, logger, store, filmBase, frames } = deps;

  const publishFrame = (row: FrameRow) => {
    const f = toFrame(row);
    publishRollEvent(db, row.roll_id, {
      type: 'frame',
      frameId: f.id,
      status: f.status,
      qcFlags: f.qcFlags,
      error: f.error,
    });
  };

  async function cancelRequested(jobId: number): Promise<boolean> {
    const row = await findJobById(db, jobId);
    return !row || row.cancel_requested === 1 || row.state !== 'running';
  }

  async function renderOne(job: JobRow, frame: FrameRow, context: RollContext): Promise<void> {
    for (;;) {
      if (deps.stopping() || (await cancelRequested(job.id))) return;
      const at = clock.now();
      const attempt = frame.attempts + 1;
      publishFrame(await markFrameInverting(db, frame.id, attempt));
      try {
        const chosen = filmBase.choose(frame, context.rollBase);
        if (!chosen.usable) throw new NoBaseError(chosen.reason);
        const rendered = await renderFrame(deps.pool(), store, {
          sourcePath: await frameSourcePath(db, store, frame),
          fileName: frame.file_name,
          profile: context.profile,
          scanner: context.scanner,
          base: chosen.base,
          roll: context.adjustments,
          frame: readStoredAdjustments(frame.adjustments),
          formats: context.formats,
          longEdge: context.longEdge,
          maxPixels: config.uploads.maxPixels,
          ...(context.levels ? { levels: context.levels } : {}),
          ...(context.levelsSource ? { levelsSource: context.levelsSource } : {}),
        });
        const done = await db.transaction().execute(async (trx) => {
          const now = clock.now();
          for (const output of rendered.outputs) {
            const file = await recordFile(trx, {
              sha256: output.sha256,
              size: output.size,
              mediaType: output.mediaType,
              at: now,
            });
            await putFrameOutput(trx, { frameId: frame.id, kind: output.kind, fileId: file.id, at: now });
          }
          const row = await markFrameDone(trx, frame.id, {
            qcFlags: [...chosen.flags, ...rendered.qcFlags],
            baseSource: chosen.source,
            at: now,
          });
          return { row, jobRow: await countFrameOfJob(trx, job.id, 'done', now) };
        });
        publishFrame(done.row);
        deps.publishJob(done.jobRow);
        await deps.afterFrame?.(frame.id);
        return;
      } catch (err) {
        const noBase = err instanceof NoBaseError;
        const final = noBase || attempt >= maxFrameAttempts;
        const message = err instanceof Error ? err.message : String(err);
        logger.warn(
          { err, frameId: frame.id, attempt },
          final ? 'frame failed' : 'frame render failed, retrying',
        );
        const failed = await db.transaction().execute(async (trx) => {
          const row = await markFrameTryFailed(trx, frame.id, {
            final,
            error: message,
            ...(noBase ? { qcFlags: ['no-base' as const] } : {}),
          });
          const jobRow = final ? await countFrameOfJob(trx, job.id, 'failed', at) : undefined;
          return { row, jobRow };
        });
        publishFrame(failed.row);
        if (failed.jobRow) deps.publishJob(failed.jobRow);
        if (final) return;
        frame = failed.row;
      }
    }
  }

  async function rollContext(roll: RollListRow, all: FrameRow[]): Promise<RollContext> {
    const version = await findVersionById(db, roll.profile_version_id);
    if (!version)
      throw new Error(`Roll ${roll.id} pins profile version ${roll.profile_version_id}, which is gone.`);
    const order = await findOrderById(db, roll.order_id);
    if (!order) throw new Error(`Roll ${roll.id} belongs to order ${roll.order_id}, which is gone.`);
    return {
      profile: JSON.parse(version.parameters) as ProfileDocument,
      scanner: await scannerProfileOf(db, roll.scanner_id),
      adjustments: readStoredAdjustments(roll.adjustments),
      rollBase: filmBase.rollBase(roll, all),
      formats: JSON.parse(order.output_formats) as OutputFormat[],
      longEdge: scanSizeLongEdge[order.scan_size as ScanSize] ?? null,
    };
  }

  /**
   * Levels of the whole roll: every frame measured against the base it renders with, combined by `rollLevels`.
   * Measured from all frames, done or not, so a resumed job renders with the same levels as before. Frames are
   * read as many at a time as frames are rendered (a decode keeps about one core busy), and combined in frame order.
   */
  async function rollWideLevels(all: FrameRow[], context: RollContext): Promise<FrameLevels | undefined> {
    const measured = await Promise.all(
      all.map((frame) =>
        frames.add(async (): Promise<FrameLevels | null> => {
          try {
            const chosen = filmBase.choose(frame, context.rollBase);
            if (!chosen.usable) throw new NoBaseError(chosen.reason);
            const negative = await readNegative(await frameSourcePath(db, store, frame), {
              maxPixels: config.uploads.maxPixels,
            });
            return measureLevels(negative, { ...context, render: 'print' }, chosen.base);
          } catch (err) {
            // a frame with no base or an unreadable scan fails on its own when rendered; it just does not count here
            logger.debug({ err, frameId: frame.id }, 'frame left out of the roll levels');
            return null;
          }
        }),
      ),
    );
    const usable = measured.filter((levels): levels is FrameLevels => levels !== null);
    return usable.length ? rollLevels(usable).roll : undefined;
  }

  return {
    /**
     * Renders the frames of the job's roll that are queued or were being inverted when a process stopped, and
     * answers the roll. Throws when the roll is gone or its profile version or order cannot be read.
     */
    async render(job: JobRow): Promise<RollListRow> {
      const rollId = rollIdOfTarget(job.target);
      const roll = rollId === null ? undefined : await findRollById(db, rollId);
      if (!roll) throw new Error(`Job ${job.id} targets ${job.target}, which does not exist.`);
      const all = await listFramesOfRoll(db, roll.id);
      const context = await rollContext(roll, all);
      const payload = JSON.parse(job.payload) as {
        levels?: 'frame' | 'roll' | 'metered';
        exposureIndex?: number;
      };
      if (payload.levels === 'roll') {
        const levels = await rollWideLevels(all, context);
        if (levels) Object.assign(context, { levels, levelsSource: 'roll' });
      } else if (payload.levels === 'metered') {
        // The EI recorded when the job was queued, so a resumed job renders as it began.
        context.levels = meteredLevels(context.profile, payload.exposureIndex ?? roll.ei);
        context.levelsSource = 'metered';
      }
      const todo = all.filter((f) => f.status === 'queued' || f.status === 'inverting');
      await Promise.all(todo.map((frame) => frames.add(() => renderOne(job, frame, context))));
      return roll;
    },

    /** A roll whose job finished: inverted, or needing attention while a frame failed or is left; its order moves on. */
    async finished(roll: RollListRow, at: Date): Promise<void> {
      const after = await listFramesOfRoll(db, roll.id);
      const attention = after.some((f) => f.status === 'failed' || f.status === 'queued');
      await setRollStatus(db, roll.id, attention ? 'needs-attention' : 'inverted', at);
      await advanceOrderWithWork(db, roll.order_id, at);
    },

    /** A roll whose job was cancelled: back to scanned. */
    async cancelled(roll: RollListRow, at: Date): Promise<void> {
      await setRollStatus(db, roll.id, 'scanned', at);
    },

    /** A roll whose job failed for good: it needs attention. */
    async failed(rollId: number, at: Date): Promise<void> {
      await setRollStatus(db, rollId, 'needs-attention', at);
    },
  };
}

export type RollJob = ReturnType<typeof createRollJob>;
