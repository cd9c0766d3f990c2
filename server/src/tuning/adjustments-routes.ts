import { adjustmentsSchema, idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createAdjustmentsService } from './adjustments-service';

/**
 * Tuning of a roll (printer points, exposure, contrast; a single frame's is in `frames/`). A change puts the roll's
 * frames back in the queue, so the next inversion renders them again; their full-size outputs are offered again once
 * rendered anew (the preview keeps showing the last render).
 */
export const adjustmentsRoutes: RouteModule = (api, { db, clock }) => {
  const adjustments = createAdjustmentsService({ db, clock });

  api.define(
    {
      method: 'put',
      path: '/api/rolls/:id/adjustments',
      roles: staffRoles,
      params: idParamsSchema,
      body: adjustmentsSchema,
      summary: 'Tune a roll: balance in printer points, exposure in stops, contrast',
    },
    async (_req, res, { params, body, user }) => {
      res.json(await adjustments.adjustRoll(user!, params.id, body));
    },
  );
};
