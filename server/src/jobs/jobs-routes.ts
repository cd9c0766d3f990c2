import { idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createInversionService } from './inversion-service';

/** Background jobs: look at one, cancel one. */
export const jobsRoutes: RouteModule = (api, { db, clock }) => {
  const inversion = createInversionService({ db, clock });

  api.define(
    { method: 'get', path: '/api/jobs/:id', roles: staffRoles, params: idParamsSchema, summary: 'A job' },
    async (_req, res, { params }) => {
      res.json(await inversion.find(params.id));
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
      res.status(202).json(await inversion.cancel(user!, params.id));
    },
  );
};
