import { idParamsSchema, staffRoles } from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { recordOrderAudit } from '../orders/record-order-audit';
import { setRollStatus } from '../rolls/roll-repository';
import { findJobById, rollIdOfTarget, toJob, updateJob } from './job-repository';
import { publishRollEvent } from './roll-events';

const jobNotFound = (id: number) => new AppError('job-not-found', 404, `No job with id ${id}.`);

/** Background jobs: look at one, cancel one. */
export const jobsRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/jobs/:id', roles: staffRoles, params: idParamsSchema, summary: 'A job' },
    async (_req, res, { params }) => {
      const job = await findJobById(db, params.id);
      if (!job) throw jobNotFound(params.id);
      res.json(toJob(job));
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/jobs/:id/cancel',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'Cancel a job; a running one stops after the frame in hand',
    },
    async (_req, res, { params, user }) => {
      const job = await db.transaction().execute(async (trx) => {
        const before = await findJobById(trx, params.id);
        if (!before) throw jobNotFound(params.id);
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
          actor: user!,
          action: 'inversion-cancelled',
          target: before.target,
          details: { jobId: before.id, state: before.state },
        });
        return after!;
      });
      const rollId = rollIdOfTarget(job.target);
      if (rollId !== null) publishRollEvent(db, rollId, { type: 'job', job: toJob(job) });
      res.status(202).json(toJob(job));
    },
  );
};
