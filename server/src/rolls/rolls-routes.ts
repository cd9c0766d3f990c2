import {
  idParamsSchema,
  invertRollRequestSchema,
  rollBaseRequestSchema,
  staffRoles,
  type RollEvent,
} from '@clearbase/contracts';
import { createFileStore } from '../files/file-store';
import { baseChangeHandler } from '../film-base/base-change-handler';
import { createFilmBaseService } from '../film-base/film-base-service';
import { visibleFramesFor } from '../frames/frame-access';
import { listFramesOfRoll, outputFormatsOfFrames, toFrame } from '../frames/frame-repository';
import type { RouteModule } from '../http/route-module';
import { createInversionService } from '../jobs/inversion-service';
import { latestJobOf, rollTarget, toJob } from '../jobs/job-repository';
import { onCloseRollStreams, subscribeRollEvents } from '../jobs/roll-events';
import { isStaff } from '../orders/order-access';
import { loadRollFor } from './roll-access';
import { toRoll } from './roll-repository';

const everyone = ['customer', ...staffRoles] as const;
// 15 s between heartbeats keeps proxies from closing an idle stream (most time out after 30-60 s); from memory
export const heartbeatMs = 15_000;

/** A roll with its frames, its inversion job, its base, and its live stream of changes. */
export const rollsRoutes: RouteModule = (api, { db, config, clock }) => {
  const inversion = createInversionService({ db, clock });
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
      const frames = await visibleFramesFor(db, await listFramesOfRoll(db, roll.id), user!);
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
      res.status(202).json(await inversion.start(user!, params.id, body));
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
      summary: 'Live job progress of a roll and, for staff, each frame’s status (Server-Sent Events)',
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
      // a customer follows the job's progress; frames are theirs to see only once the lab approves them
      const customer = !isStaff(user!);
      const send = (event: RollEvent) => {
        if (customer && event.type === 'frame') return;
        res.write(`event: ${event.type}\ndata: ${JSON.stringify(event)}\n\n`);
      };
      // reconnecting clients wait 3 s (the EventSource default is about that; we say it outright)
      res.write('retry: 3000\n\n');
      // listen first, then send where things stand, so a client (re)connecting misses nothing in between
      const unsubscribe = subscribeRollEvents(db, roll.id, send);
      const job = await latestJobOf(db, rollTarget(roll.id));
      if (job) send({ type: 'job', job: toJob(job) });
      for (const frame of customer ? [] : (await listFramesOfRoll(db, roll.id)).map((f) => toFrame(f))) {
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
