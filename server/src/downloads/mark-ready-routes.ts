import { idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createMarkReadyService } from './mark-ready-service';

/** Staff tell the customer an order is ready (the rules are in mark-ready-service.ts). */
export const markReadyRoutes: RouteModule = (api, { db, config, clock }) => {
  const ready = createMarkReadyService({ db, clock, config });

  api.define(
    {
      method: 'get',
      path: '/api/orders/:id/readiness',
      roles: staffRoles,
      params: idParamsSchema,
      summary:
        'Whether the order may be marked ready now: what blocks it (closed, no rolls, unpaid), each roll still waiting',
    },
    async (_req, res, { params, user }) => {
      res.json(await ready.readiness(user!, params.id));
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/orders/:id/ready',
      roles: staffRoles,
      params: idParamsSchema,
      summary:
        'Mark an order ready once every roll is approved and it is paid (or the lab takes payment on collection); mails the customer a download link',
    },
    async (_req, res, { params, user }) => {
      res.json(await ready.markReady(user!, params.id));
    },
  );
};
