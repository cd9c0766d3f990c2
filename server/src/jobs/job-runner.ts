import type { Kysely } from 'kysely';
import { readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import PQueue from 'p-queue';
import type { Logger } from 'pino';
import type { BackgroundService } from '../background-service';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { createFilmBaseService } from '../film-base/film-base-service';
import { createFileStore, type FileStore } from '../files/file-store';
import { createInversionPool, type InversionPool } from '../inversion-pool/inversion-pool';
import type { JobRow } from './job-tables';
import {
  claimNextJob,
  findJobById,
  renewLease,
  requeueExpired,
  rollIdOfTarget,
  toJob,
  updateJob,
} from './job-repository';
import { onJobQueued, publishRollEvent } from './roll-events';
import { createRollJob, type RollJob } from './roll-job';

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

/**
 * The durable inversion queue: jobs are rows of the jobs table, run in this process on p-queue with bounded
 * concurrency, their pixels inverted on the worker-thread pool; what one roll's job does is `createRollJob`'s.
 *
 * A job is claimed with a lease the running process renews; a process that dies lets the lease run out and the next
 * one (or this one, on restart) takes the job up again where the roll left off: its frames done stay done, the others
 * are rendered, none twice. A job that fails is tried again, `maxJobAttempts` times in all (a process dying counts
 * one). Cancelling takes effect between frames. `stop()` drains: the frames in hand finish, the job goes back to the
 * queue.
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
  let rollJob: RollJob | undefined;
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

  function rollJobOf(files: FileStore): RollJob {
    rollJob ??= createRollJob({
      db,
      config,
      clock,
      logger,
      store: files,
      filmBase: createFilmBaseService({ db, store: files, clock, maxPixels: config.uploads.maxPixels }),
      frames,
      pool: () => (pool ??= createInversionPool(options.threads ? { threads: options.threads } : {})),
      stopping: () => stopping,
      publishJob,
      ...(options.afterFrame ? { afterFrame: options.afterFrame } : {}),
    });
    return rollJob;
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
    store ??= createFileStore(config.dataDir);
    const roller = rollJobOf(store);
    try {
      const roll = await roller.render(job);

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
        await roller.cancelled(roll, at);
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
        await roller.finished(roll, at);
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
      if (final && rollId !== null) await roller.failed(rollId, at).catch(() => undefined);
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
