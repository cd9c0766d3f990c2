import { auditQuerySchema } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { listAudit } from './audit-log';

export const auditRoutes: RouteModule = (api, { db }) => {
  api.define(
    {
      method: 'get',
      path: '/api/audit',
      roles: ['admin'],
      query: auditQuerySchema,
      summary: 'Audit log, newest first',
    },
    async (_req, res, { query }) => {
      res.json(await listAudit(db, query));
    },
  );
};
