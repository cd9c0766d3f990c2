import { adjustmentsSchema, idParamsSchema, staffRoles } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { recordOrderAudit } from '../orders/record-order-audit';
import { loadRollFor } from './roll-access';
import { findRollById, toRoll } from './roll-repository';

/**
 * Tuning of a roll (printer points, exposure, contrast; a single frame's is in `frames/`). A change puts the roll's
 * frames back in the queue, so the next inversion renders them again; their full-size outputs are offered again once
 * rendered anew (the preview keeps showing the last render).
 */
export const adjustmentsRoutes: RouteModule = (api, { db, clock }) => {
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
      const before = await loadRollFor(db, params.id, user!);
      const roll = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        await trx
          .updateTable('rolls')
          .set({ adjustments: JSON.stringify(body), updated_at: at.toISOString() })
          .where('id', '=', before.id)
          .execute();
        await trx
          .updateTable('frames')
          .set({ status: 'queued', attempts: 0, error: null })
          .where('roll_id', '=', before.id)
          .where('status', '!=', 'inverting')
          .execute();
        await recordOrderAudit(trx, {
          at,
          actor: user!,
          action: 'roll-adjusted',
          target: `roll:${before.id}`,
          details: { before: JSON.parse(before.adjustments), after: body },
        });
        return toRoll((await findRollById(trx, before.id))!);
      });
      res.json(roll);
    },
  );
};
