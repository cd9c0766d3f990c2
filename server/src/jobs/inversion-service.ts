import type { InvertRollRequest, Job, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { listFramesOfRoll, requeueFrames } from '../frames/frame-repository';
import { recordOrderAudit } from '../orders/record-order-audit';
import { loadRollFor } from '../rolls/roll-access';
import { setRollStatus } from '../rolls/roll-repository';
import {
  activeJobOf,
  findJobById,
  insertJob,
  rollIdOfTarget,
  rollTarget,
  toJob,
  updateJob,
} from './job-repository';
import { announceJobQueued, publishRollEvent } from './roll-events';

export type InversionService = ReturnType<typeof createInversionService>;

const jobNotFound = (id: number) => new AppError('job-not-found', 404, `No job with id ${id}.`);

/**
 * Starting and stopping a roll's batch inversion, each audited in one transaction and announced on the roll's live
 * stream; the queue (`createJobRunner`) picks the job up.
 *
 * @example const job = await createInversionService({ db, clock }).start(user, rollId, { frames: 'pending', levels: 'frame' });
 */
export function createInversionService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    /** A job by id. Throws 404 when there is none. */
    async find(jobId: number): Promise<Job> {
      const job = await findJobById(db, jobId);
      if (!job) throw jobNotFound(jobId);
      return toJob(job);
    },

    /**
     * Queues the roll's inversion for `actor`: the frames not done yet, or all of them again, with each frame's own
     * levels, the whole roll's, or none at the metered exposure for the roll's EI (recorded on the job). A roll already queued or inverting answers its job instead of a second one. Throws
     * 404 for a roll not theirs to see, 409 for a roll with no scans.
     */
    async start(actor: User, rollId: number, request: InvertRollRequest): Promise<Job> {
      const roll = await loadRollFor(db, rollId, actor);
      const target = rollTarget(roll.id);
      const running = await activeJobOf(db, target);
      if (running) return toJob(running);
      const job = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const frames = await listFramesOfRoll(trx, roll.id);
        if (frames.length === 0) {
          throw new AppError(
            'roll-has-no-frames',
            409,
            `Roll ${roll.id} has no scans yet; upload them first.`,
          );
        }
        const again = request.frames === 'all' ? frames : frames.filter((f) => f.status !== 'done');
        await requeueFrames(
          trx,
          again.map((f) => f.id),
        );
        const job = await insertJob(trx, {
          kind: 'invert-roll',
          target,
          payload: {
            rollId: roll.id,
            frames: request.frames,
            levels: request.levels,
            ...(request.levels === 'metered' ? { exposureIndex: roll.ei } : {}),
          },
          total: again.length,
          by: actor.id,
          at,
        });
        await setRollStatus(trx, roll.id, 'inverting', at);
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'inversion-started',
          target,
          details: { jobId: job.id, frames: request.frames, levels: request.levels, count: again.length },
        });
        return job;
      });
      publishRollEvent(db, roll.id, { type: 'job', job: toJob(job) });
      announceJobQueued(db);
      return toJob(job);
    },

    /**
     * Cancels a job for `actor`: a queued one at once (its roll goes back to scanned), a running one after the frame
     * in hand. Throws 404 for no such job, 409 for one already finished.
     */
    async cancel(actor: User, jobId: number): Promise<Job> {
      const job = await db.transaction().execute(async (trx) => {
        const before = await findJobById(trx, jobId);
        if (!before) throw jobNotFound(jobId);
        if (before.state !== 'queued' && before.state !== 'running') {
          throw new AppError('job-finished', 409, `Job ${before.id} is already ${before.state}.`);
        }
        const at = clock.now();
        const rollId = rollIdOfTarget(before.target);
        const after =
          before.state === 'queued'
            ? await updateJob(
                trx,
                before.id,
                { state: 'cancelled', cancel_requested: 1, finished_at: at.toISOString(), lease_until: null },
                at,
              )
            : await updateJob(trx, before.id, { cancel_requested: 1 }, at);
        if (before.state === 'queued' && rollId !== null) await setRollStatus(trx, rollId, 'scanned', at);
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'inversion-cancelled',
          target: before.target,
          details: { jobId: before.id, state: before.state },
        });
        return after!;
      });
      const rollId = rollIdOfTarget(job.target);
      if (rollId !== null) publishRollEvent(db, rollId, { type: 'job', job: toJob(job) });
      return toJob(job);
    },
  };
}
