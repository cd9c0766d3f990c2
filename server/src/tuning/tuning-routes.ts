import { idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { tuningSheet } from './tuning-sheet';

/**
 * The tuning screen's server side: a roll's tuning sheet. A frame's working negative for the live preview is in
 * `frames/`, frame reviews are in `review/`.
 */
export const tuningRoutes: RouteModule = (api, { db }) => {
  api.define(
    {
      method: 'get',
      path: '/api/rolls/:id/tuning',
      roles: staffRoles,
      params: idParamsSchema,
      summary: 'A roll’s tuning sheet: pinned profile, scanner, roll and frames with their reviews',
    },
    async (_req, res, { params, user }) => {
      res.json(await tuningSheet(db, params.id, user!));
    },
  );
};
