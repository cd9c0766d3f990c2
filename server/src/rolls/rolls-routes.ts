import {
  idParamsSchema,
  invertRollRequestSchema,
  rollBaseRequestSchema,
  staffRoles,
  type RollEvent,
} from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import { createFileStore } from '../files/file-store';
import { baseChangeHandler } from '../film-base/base-change-handler';
import { createFilmBaseService } from '../film-base/film-base-service';
import { listFramesOfRoll, outputFormatsOfFrames, toFrame } from '../frames/frame-repository';
import type { RouteModule } from '../http/route-module';
import { activeJobOf, insertJob, latestJobOf, rollTarget, toJob } from '../jobs/job-repository';
import {
  announceJobQueued,
  onCloseRollStreams,
  publishRollEvent,
  subscribeRollEvents,
} from '../jobs/roll-events';
import { recordOrderAudit } from '../orders/record-order-audit';
import { loadRollFor } from './roll-access';
import { setRollStatus, toRoll } from './roll-repository';

const everyone = ['customer', ...staffRoles] as const;
// 15 s between heartbeats keeps proxies from closing an idle stream (most time out after 30-60 s); from memory
export const heartbeatMs = 15_000;

/** A roll with its frames, its inversion job, its base, and its live stream of changes. */
export const rollsRoutes: RouteModule = (api, { db, config, clock }) => {
  const filmBase = createFilmBaseService({
    db,
    store: createFileStore(config.dataDir),
    clock,
    maxPixels: config.uploads.maxPixels,
  });

  api.define(
    {
      method: 'get',
      path: '/api/rolls/:id',
      roles: everyone,
      params: idParamsSchema,
      summary: 'A roll with its frames and its latest inversion job',
    },
    async (_req, res, { params, user }) => {
      const roll = await loadRollFor(db, params.id, user!);
      const frames = await listFramesOfRoll(db, roll.id);
      const outputs = await outputFormatsOfFrames(
        db,
        frames.map((f) => f.id),
      );
      const job = await latestJobOf(db, rollTarget(roll.id));
      res.json({
        roll: toRoll(roll),
        frames: frames.map((f) => toFrame(f, outputs.get(f.id))),
        job: job ? toJob(job) : null,
      });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/rolls/:id/invert',
      roles: staffRoles,
      params: idParamsSchema,
      body: invertRollRequestSchema,
      summary: 'Start (or restart) the roll’s batch inversion; answers 202 with the job',
    },
    async (_req, res, { params, body, user }) => {
      const roll = await loadRollFor(db, params.id, user!);
      const target = rollTarget(roll.id);
      const running = await activeJobOf(db, target);
      if (running) {
        res.status(202).json(toJob(running));
        return;
      }
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
        const again = body.frames === 'all' ? frames : frames.filter((f) => f.status !== 'done');
        if (again.length) {
          await trx
            .updateTable('frames')
            .set({ status: 'queued', attempts: 0, error: null })
            .where(
              'id',
              'in',
              again.map((f) => f.id),
            )
            .execute();
        }
        const job = await insertJob(trx, {
          kind: 'invert-roll',
          target,
          payload: { rollId: roll.id, frames: body.frames, levels: body.levels },
          total: again.length,
          by: user!.id,
          at,
        });
        await setRollStatus(trx, roll.id, 'inverting', at);
        await recordOrderAudit(trx, {
          at,
          actor: user!,
          action: 'inversion-started',
          target,
          details: { jobId: job.id, frames: body.frames, levels: body.levels, count: again.length },
        });
        return job;
      });
      publishRollEvent(db, roll.id, { type: 'job', job: toJob(job) });
      announceJobQueued(db);
      res.status(202).json(toJob(job));
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/rolls/:id/base',
      roles: staffRoles,
      params: idParamsSchema,
      body: rollBaseRequestSchema,
      summary: 'Set the roll base: automatic, or a rectangle on one of its frames',
    },
    baseChangeHandler(filmBase.setRollBase),
  );

  api.define(
    {
      method: 'get',
      path: '/api/rolls/:id/events',
      roles: everyone,
      params: idParamsSchema,
      summary: 'Live job progress and frame status of a roll (Server-Sent Events)',
    },
    async (req, res, { params, user }) => {
      const roll = await loadRollFor(db, params.id, user!);
      res.writeHead(200, {
        'Content-Type': 'text/event-stream; charset=utf-8',
        'Cache-Control': 'no-cache, no-transform',
        Connection: 'keep-alive',
        // nginx and similar proxies buffer responses unless told not to
        'X-Accel-Buffering': 'no',
      });
      const send = (event: RollEvent) =>
        res.write(`event: ${event.type}\ndata: ${JSON.stringify(event)}\n\n`);
      // reconnecting clients wait 3 s (the EventSource default is about that; we say it outright)
      res.write('retry: 3000\n\n');
      // listen first, then send where things stand, so a client (re)connecting misses nothing in between
      const unsubscribe = subscribeRollEvents(db, roll.id, send);
      const job = await latestJobOf(db, rollTarget(roll.id));
      if (job) send({ type: 'job', job: toJob(job) });
      for (const frame of (await listFramesOfRoll(db, roll.id)).map((f) => toFrame(f))) {
        send({
          type: 'frame',
          frameId: frame.id,
          status: frame.status,
          qcFlags: frame.qcFlags,
          error: frame.error,
        });
      }
      const heartbeat = setInterval(() => res.write(': heartbeat\n\n'), heartbeatMs);
      heartbeat.unref();
      const stopClosing = onCloseRollStreams(db, () => res.end());
      const close = () => {
        clearInterval(heartbeat);
        unsubscribe();
        stopClosing();
      };
      req.on('close', close);
      res.on('error', close);
    },
  );
};
