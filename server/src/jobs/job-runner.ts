import {
  readStoredAdjustments,
  scanSizeLongEdge,
  type Adjustments,
  type MeasuredBase,
  type OutputFormat,
  type ProfileDocument,
  type QcFlag,
  type ScanSize,
} from '@clearbase/contracts';
import { rollLevels, type FilmBase, type FrameLevels } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import { readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import PQueue from 'p-queue';
import type { Logger } from 'pino';
import type { BackgroundService } from '../background-service';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { recordFile } from '../files/file-repository';
import { createFileStore, type FileStore } from '../files/file-store';
import { frameSourcePath } from '../frames/frame-negative';
import { listFramesOfRoll, putFrameOutput, toFrame } from '../frames/frame-repository';
import { createInversionPool, type InversionPool } from '../inversion-pool/inversion-pool';
import { measureLevels, MIN_BASE_CONFIDENCE } from '../inversion-pool/invert-negative-file';
import { readNegative } from '../imaging/index';
import type { FrameRow, JobRow } from '../orders/order-tables';
import { scannerProfileOf } from '../rolls/roll-access';
import { findRollById, setRollStatus, type RollListRow } from '../rolls/roll-repository';
import { medianBaseOf } from '../rolls/median-base';
import {
  claimNextJob,
  findJobById,
  renewLease,
  requeueExpired,
  rollIdOfTarget,
  toJob,
  updateJob,
} from './job-repository';
import { renderFrame } from './render-frame';
import { advanceOrderWithWork } from '../orders/advance-order-with-work';
import { onJobQueued, publishRollEvent } from './roll-events';

/** Tries per frame before it is marked failed with its last error (three: the product's rule). */
export const maxFrameAttempts = 3;
/** Tries per job (a process dying mid-job counts one) before it is marked failed; as for frames (our choice). */
export const maxJobAttempts = 3;
// 30 s lease, renewed every 10 s: a dead process's job is picked up again within half a minute (our choice)
const defaultLeaseMs = 30_000;
// look for work every 2 s even when nobody announced any (a job added by another process), our choice
const defaultPollMs = 2_000;

export interface JobRunnerOptions {
  db: Kysely<Database>;
  config: { dataDir: string; jobConcurrency: number; uploads: { maxPixels: number } };
  clock: Clock;
  logger: Logger;
  /** Worker threads of the inversion pool. Default: one per core. */
  threads?: number;
  leaseMs?: number;
  pollMs?: number;
  /**
   * Empty DATA_DIR/tmp on start: what a killed process was writing there is of no use. Default true; start the
   * runner before the server takes uploads.
   */
  sweepTempOnStart?: boolean;
  /** Called after each frame is recorded done (tests use it to slow a roll down or stop mid-way). */
  afterFrame?: (frameId: number) => void | Promise<void>;
}

export interface JobRunner extends BackgroundService {
  /** Looks for queued work now instead of at the next poll. */
  wake(): void;
}

class NoBaseError extends Error {}

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

function usable(base: MeasuredBase | null, minConfidence: number): base is MeasuredBase {
  return base !== null && base.rgb.every((v) => v > 0 && v <= 1) && base.confidence >= minConfidence;
}

function toFilmBase(base: MeasuredBase): FilmBase {
  const r = base.region;
  return {
    rgb: base.rgb,
    region: r ? [r.x, r.y, r.width, r.height] : [0, 0, 0, 0],
    confidence: base.confidence,
  };
}

/**
 * The base a frame is inverted against, in order: its drawn rectangle, its own detected base, the roll base (flagged
 * `roll-base-used`). With none usable the frame cannot be rendered (`no-base`).
 */
export function chooseBase(
  frame: FrameRow,
  rollBase: MeasuredBase | null,
): { base: FilmBase; source: 'frame' | 'region' | 'roll'; flags: QcFlag[] } {
  const own = parse<MeasuredBase>(frame.base_measured);
  if (frame.base_mode === 'region' && usable(own, Number.MIN_VALUE))
    return { base: toFilmBase(own), source: 'region', flags: [] };
  if (frame.base_mode === 'auto' && usable(own, MIN_BASE_CONFIDENCE))
    return { base: toFilmBase(own), source: 'frame', flags: [] };
  if (usable(rollBase, Number.MIN_VALUE))
    return { base: toFilmBase(rollBase), source: 'roll', flags: ['roll-base-used'] };
  throw new NoBaseError(
    'No usable film base in this frame nor on the roll; draw the base by hand over the rebate or leader.',
  );
}

/**
 * The durable inversion queue: jobs are rows of the jobs table, run in this process on p-queue with bounded
 * concurrency, their pixels inverted on the worker-thread pool.
 *
 * A roll job renders each frame not yet done; each frame's files are flushed and renamed into the store before one
 * transaction marks the frame done and counts it, so a process killed at any moment leaves every frame either done
 * with all its outputs or still to do, and a restart (its lease run out) carries on without writing any frame twice.
 * Cancelling takes effect between frames. `stop()` drains: the frames in hand finish, the job goes back to the queue.
 *
 * @example
 * const runner = createJobRunner({ db, config, clock: systemClock, logger });
 * await runner.start(); // resumes what a previous process left
 * process.once('SIGTERM', () => runner.stop());
 */
export function createJobRunner(options: JobRunnerOptions): JobRunner {
  const { db, config, clock, logger } = options;
  const leaseMs = options.leaseMs ?? defaultLeaseMs;
  const pollMs = options.pollMs ?? defaultPollMs;
  const frames = new PQueue({ concurrency: config.jobConcurrency });
  let store: FileStore | undefined;
  let pool: InversionPool | undefined;
  let stopping = false;
  let loop: Promise<void> | undefined;
  let wakeUp: (() => void) | undefined;
  let stopListening: (() => void) | undefined;
  const later = (ms: number) => new Date(clock.now().getTime() + ms);

  const wake = () => wakeUp?.();
  const sleep = () =>
    new Promise<void>((resolve) => {
      const timer = setTimeout(done, pollMs);
      function done() {
        clearTimeout(timer);
        wakeUp = undefined;
        resolve();
      }
      wakeUp = done;
    });

  const publishJob = (row: JobRow) => {
    const rollId = rollIdOfTarget(row.target);
    if (rollId !== null) publishRollEvent(db, rollId, { type: 'job', job: toJob(row) });
  };
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

  async function renderOne(
    job: JobRow,
    roll: RollListRow,
    frame: FrameRow,
    context: RollContext,
  ): Promise<void> {
    for (;;) {
      if (stopping || (await cancelRequested(job.id))) return;
      const at = clock.now();
      const attempt = frame.attempts + 1;
      const inverting = await db
        .updateTable('frames')
        .set({ status: 'inverting', attempts: attempt })
        .where('id', '=', frame.id)
        .returningAll()
        .executeTakeFirstOrThrow();
      publishFrame(inverting);
      try {
        const chosen = chooseBase(frame, context.rollBase);
        const rendered = await renderFrame(pool!, store!, {
          sourcePath: await frameSourcePath(db, store!, frame),
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
          const row = await trx
            .updateTable('frames')
            .set({
              status: 'done',
              qc_flags: JSON.stringify([...chosen.flags, ...rendered.qcFlags]),
              base_source: chosen.source,
              error: null,
              rendered_at: now.toISOString(),
            })
            .where('id', '=', frame.id)
            .returningAll()
            .executeTakeFirstOrThrow();
          const jobRow = await trx
            .updateTable('jobs')
            .set((eb) => ({ progress_done: eb('progress_done', '+', 1), updated_at: now.toISOString() }))
            .where('id', '=', job.id)
            .returningAll()
            .executeTakeFirstOrThrow();
          return { row, jobRow };
        });
        publishFrame(done.row);
        publishJob(done.jobRow);
        await options.afterFrame?.(frame.id);
        return;
      } catch (err) {
        const final = err instanceof NoBaseError || attempt >= maxFrameAttempts;
        const message = err instanceof Error ? err.message : String(err);
        logger.warn(
          { err, frameId: frame.id, attempt },
          final ? 'frame failed' : 'frame render failed, retrying',
        );
        const failed = await db.transaction().execute(async (trx) => {
          const row = await trx
            .updateTable('frames')
            .set({
              status: final ? 'failed' : 'queued',
              error: message,
              ...(err instanceof NoBaseError ? { qc_flags: JSON.stringify(['no-base']) } : {}),
            })
            .where('id', '=', frame.id)
            .returningAll()
            .executeTakeFirstOrThrow();
          const jobRow = final
            ? await trx
                .updateTable('jobs')
                .set((eb) => ({
                  progress_failed: eb('progress_failed', '+', 1),
                  updated_at: at.toISOString(),
                }))
                .where('id', '=', job.id)
                .returningAll()
                .executeTakeFirstOrThrow()
            : undefined;
          return { row, jobRow };
        });
        publishFrame(failed.row);
        if (failed.jobRow) publishJob(failed.jobRow);
        if (final) return;
        frame = failed.row;
      }
    }
  }

  interface RollContext {
    profile: ProfileDocument;
    scanner: Awaited<ReturnType<typeof scannerProfileOf>>;
    adjustments: Adjustments;
    rollBase: MeasuredBase | null;
    formats: OutputFormat[];
    longEdge: number | null;
    /** Roll-wide levels, when the job asked for them. */
    levels?: FrameLevels;
  }

  async function rollContext(roll: RollListRow, all: FrameRow[]): Promise<RollContext> {
    const version = await db
      .selectFrom('profile_versions')
      .select('parameters')
      .where('id', '=', roll.profile_version_id)
      .executeTakeFirstOrThrow();
    const order = await db
      .selectFrom('orders')
      .select(['output_formats', 'scan_size'])
      .where('id', '=', roll.order_id)
      .executeTakeFirstOrThrow();
    return {
      profile: JSON.parse(version.parameters) as ProfileDocument,
      scanner: await scannerProfileOf(db, roll.scanner_id),
      adjustments: readStoredAdjustments(roll.adjustments),
      rollBase: roll.base_mode === 'region' ? parse<MeasuredBase>(roll.base_measured) : medianBaseOf(all),
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
            const { base } = chooseBase(frame, context.rollBase);
            const negative = await readNegative(await frameSourcePath(db, store!, frame), {
              maxPixels: config.uploads.maxPixels,
            });
            return measureLevels(negative, { ...context, render: 'print' }, base);
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

  async function runJob(job: JobRow): Promise<void> {
    publishJob(job);
    const lease = setInterval(() => {
      renewLease(db, job.id, later(leaseMs)).catch((err: unknown) =>
        logger.warn({ err }, 'lease renewal failed'),
      );
    }, leaseMs / 3);
    lease.unref();
    const rollId = rollIdOfTarget(job.target);
    try {
      const roll = rollId === null ? undefined : await findRollById(db, rollId);
      if (!roll) throw new Error(`Job ${job.id} targets ${job.target}, which does not exist.`);
      const all = await listFramesOfRoll(db, roll.id);
      const context = await rollContext(roll, all);
      const payload = JSON.parse(job.payload) as { levels?: 'frame' | 'roll' };
      if (payload.levels === 'roll') {
        const levels = await rollWideLevels(all, context);
        if (levels) context.levels = levels;
      }
      const todo = all.filter((f) => f.status === 'queued' || f.status === 'inverting');
      store ??= createFileStore(config.dataDir);
      pool ??= createInversionPool(options.threads ? { threads: options.threads } : {});
      await Promise.all(todo.map((frame) => frames.add(() => renderOne(job, roll, frame, context))));

      const at = clock.now();
      const latest = (await findJobById(db, job.id))!;
      let finished: JobRow | undefined;
      if (latest.cancel_requested) {
        finished = await updateJob(
          db,
          job.id,
          { state: 'cancelled', finished_at: at.toISOString(), lease_until: null },
          at,
        );
        await setRollStatus(db, roll.id, 'scanned', at);
      } else if (stopping) {
        // drained on shutdown: back in the queue, taken up first on the next start
        finished = await updateJob(db, job.id, { state: 'queued', lease_until: null }, at);
      } else {
        finished = await updateJob(
          db,
          job.id,
          { state: 'done', finished_at: at.toISOString(), lease_until: null },
          at,
        );
        const after = await listFramesOfRoll(db, roll.id);
        const attention = after.some((f) => f.status === 'failed' || f.status === 'queued');
        await setRollStatus(db, roll.id, attention ? 'needs-attention' : 'inverted', at);
        await advanceOrderWithWork(db, roll.order_id, at);
      }
      if (finished) publishJob(finished);
    } catch (err) {
      const at = clock.now();
      const final = job.attempts >= maxJobAttempts;
      logger.error({ err, jobId: job.id }, final ? 'job failed' : 'job failed, will retry');
      const row = await updateJob(
        db,
        job.id,
        final
          ? {
              state: 'failed',
              error: err instanceof Error ? err.message : String(err),
              finished_at: at.toISOString(),
              lease_until: null,
            }
          : { state: 'queued', lease_until: null },
        at,
      );
      if (final && rollId !== null)
        await setRollStatus(db, rollId, 'needs-attention', at).catch(() => undefined);
      if (row) publishJob(row);
    } finally {
      clearInterval(lease);
    }
  }

  async function run(): Promise<void> {
    while (!stopping) {
      try {
        const requeued = await requeueExpired(db, clock.now());
        if (requeued) logger.info({ requeued }, 'resuming jobs whose process stopped');
        const job = await claimNextJob(db, clock.now(), later(leaseMs));
        if (job) await runJob(job);
        else await sleep();
      } catch (err) {
        logger.error({ err }, 'job queue error');
        await sleep();
      }
    }
  }

  return {
    name: 'inversion queue',
    wake,
    async start() {
      if (loop) return;
      stopping = false;
      store ??= createFileStore(config.dataDir);
      if (options.sweepTempOnStart ?? true) {
        const left = await readdir(store.tmpDir);
        await Promise.all(
          left.map((name) => rm(join(store!.tmpDir, name), { force: true, recursive: true })),
        );
        if (left.length) logger.info({ files: left.length }, 'removed unfinished temp files');
      }
      stopListening = onJobQueued(db, wake);
      loop = run();
    },
    async stop() {
      stopping = true;
      stopListening?.();
      wake();
      await loop;
      loop = undefined;
      await frames.onIdle();
      await pool?.close();
      pool = undefined;
    },
  };
}
