import { idParamsSchema, staffRoles, type OrderReadiness, type RollNotApproved } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { loadOrderFor } from '../orders/order-access';
import { findOrderById, setOrderStatus, toOrder, type OrderListRow } from '../orders/order-repository';
import { recordOrderAudit } from '../orders/record-order-audit';
import { whyRollNotApproved } from '../review/roll-approval';
import { findUserById } from '../users/user-repository';
import { downloadLinkValidMs, downloadUrl } from './download-link-validity';
import { loadFileRelease } from './load-file-release';
import { readyPaymentBlocker } from './ready-payment-blocker';
import { insertDownloadToken } from './download-token-repository';

/** Each roll of the order that is not yet approved, with the reason, in roll order. */
export async function rollsNotApproved(db: Kysely<Database>, orderId: number): Promise<RollNotApproved[]> {
  const rolls = await db
    .selectFrom('rolls')
    .select('id')
    .where('order_id', '=', orderId)
    .orderBy('id')
    .execute();
  const waiting: RollNotApproved[] = [];
  for (const [i, roll] of rolls.entries()) {
    const frames = await db
      .selectFrom('frames')
      .leftJoin('frame_reviews', 'frame_reviews.frame_id', 'frames.id')
      .select(['frames.id', 'frame_reviews.decision'])
      .where('frames.roll_id', '=', roll.id)
      .execute();
    const reason = whyRollNotApproved(frames.map((f) => f.decision));
    if (reason) waiting.push({ rollId: roll.id, rollNumber: i + 1, reason });
  }
  return waiting;
}

/** Why an order cannot be marked ready whatever its rolls: it is closed or has none; null when it can. */
function orderBlocker(order: { id: number; status: string; roll_count: number }): string | null {
  if (order.status === 'delivered' || order.status === 'cancelled') {
    return `Order ${order.id} is ${order.status}; it cannot be marked ready.`;
  }
  if (order.roll_count === 0) return `Order ${order.id} has no rolls to deliver.`;
  return null;
}

/** Why payment keeps the order from being marked ready, or null. */
async function paymentBlocker(db: Kysely<Database>, order: OrderListRow): Promise<string | null> {
  return readyPaymentBlocker((await loadFileRelease(db, order)).state);
}

/** Staff tell the customer an order is ready: status `ready` and the scans-ready mail with a download link. */
export const markReadyRoutes: RouteModule = (api, { db, config, clock }) => {
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
      const order = await loadOrderFor(db, params.id, user!);
      let blocker = orderBlocker(order);
      const waiting = blocker ? [] : await rollsNotApproved(db, order.id);
      if (!blocker && waiting.length === 0) blocker = await paymentBlocker(db, order);
      const readiness: OrderReadiness = {
        ready: blocker === null && waiting.length === 0,
        blocker,
        waiting,
        linkValidHours: config.downloadLinkHours,
      };
      res.json(readiness);
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
      const order = await loadOrderFor(db, params.id, user!);
      const blocker = orderBlocker(order);
      if (blocker) {
        const closed = order.status === 'delivered' || order.status === 'cancelled';
        throw new AppError(closed ? 'order-closed' : 'order-not-approved', 409, blocker);
      }
      const waiting = await rollsNotApproved(db, order.id);
      if (waiting.length > 0) {
        throw new AppError(
          'order-not-approved',
          409,
          `Order ${order.id} is not ready: ${waiting.map((w) => `roll ${w.rollNumber} ${w.reason}`).join('; ')}.`,
          waiting.map((w) => ({ path: `rolls.${w.rollId}`, message: `Roll ${w.rollNumber} ${w.reason}` })),
        );
      }
      const unpaid = await paymentBlocker(db, order);
      if (unpaid) throw new AppError('order-not-paid', 409, unpaid);
      const customer = (await findUserById(db, order.customer_id))!;
      const updated = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        if (order.status !== 'ready') await setOrderStatus(trx, order.id, 'ready', at);
        const { token } = await insertDownloadToken(trx, {
          orderId: order.id,
          by: user!.id,
          at,
          validMs: downloadLinkValidMs(config.downloadLinkHours),
        });
        await enqueueTemplatedMail(
          trx,
          customer.email,
          'scans-ready',
          {
            name: customer.name,
            reference: `order ${order.id}`,
            url: downloadUrl(config.publicUrl, token),
            galleryUrl: `${config.publicUrl}/orders/${order.id}/gallery`,
            expiresHours: config.downloadLinkHours,
          },
          at,
        );
        await recordOrderAudit(trx, {
          at,
          actor: user!,
          action: 'order-status-changed',
          target: `order:${order.id}`,
          details: {
            before: order.status,
            after: 'ready',
            because: 'marked ready',
            mailedTo: customer.email,
          },
        });
        return toOrder((await findOrderById(trx, order.id))!);
      });
      res.json(updated);
    },
  );
};
