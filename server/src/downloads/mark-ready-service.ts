import type { OrderReadiness, Order, RollNotApproved, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { moveOrder } from '../orders/move-order';
import { loadOrderFor } from '../orders/order-access';
import { findOrderById, toOrder, type OrderListRow } from '../orders/order-repository';
import { isClosed } from '../orders/order-status';
import { decisionsByRollOfOrder } from '../review/review-repository';
import { whyRollNotApproved } from '../review/roll-approval';
import { findUserById } from '../users/user-repository';
import { downloadLinkValidMs, downloadUrl } from './download-link-validity';
import { insertDownloadToken } from './download-token-repository';
import { loadFileRelease } from './load-file-release';
import { readyPaymentBlocker } from './ready-payment-blocker';

/** Everything that keeps an order from being marked ready, each in words staff can act on. */
interface ReadyCheck {
  /** Closed, or no rolls: nothing about the rolls or the money matters then. */
  blocker: AppError | null;
  /** Each roll not approved yet, with the reason, in roll order. */
  waiting: RollNotApproved[];
  /** What is left to pay, when it keeps the order back. */
  unpaid: AppError | null;
}

async function checkReady(db: Kysely<Database>, order: OrderListRow): Promise<ReadyCheck> {
  if (isClosed(order.status)) {
    const detail = `Order ${order.id} is ${order.status}; it cannot be marked ready.`;
    return { blocker: new AppError('order-closed', 409, detail), waiting: [], unpaid: null };
  }
  if (order.roll_count === 0) {
    const detail = `Order ${order.id} has no rolls to deliver.`;
    return { blocker: new AppError('order-not-approved', 409, detail), waiting: [], unpaid: null };
  }
  const waiting: RollNotApproved[] = [];
  for (const [i, [rollId, decisions]] of [...(await decisionsByRollOfOrder(db, order.id))].entries()) {
    const reason = whyRollNotApproved(decisions);
    if (reason) waiting.push({ rollId, rollNumber: i + 1, reason });
  }
  const owed = readyPaymentBlocker((await loadFileRelease(db, order)).state);
  return { blocker: null, waiting, unpaid: owed ? new AppError('order-not-paid', 409, owed) : null };
}

/**
 * Staff tell the customer an order is ready: once every roll is approved and the order is paid (or the lab takes
 * payment on collection), its status becomes `ready` and the customer is mailed a download link; asked again, a
 * ready order's link is mailed again.
 *
 * @example
 * const ready = createMarkReadyService({ db, clock, config });
 * await ready.markReady(operator, 12); // throws 409 order-not-paid while €20.00 is left to pay
 */
export function createMarkReadyService({
  db,
  clock,
  config,
}: {
  db: Kysely<Database>;
  clock: Clock;
  config: Config;
}) {
  return {
    /** Whether the order may be marked ready now, and what keeps it back. */
    async readiness(actor: User, orderId: number): Promise<OrderReadiness> {
      const check = await checkReady(db, await loadOrderFor(db, orderId, actor));
      // the rolls first: what blocks there is what staff can do something about now
      const blocker = check.blocker ?? (check.waiting.length ? null : check.unpaid);
      return {
        ready: !blocker && check.waiting.length === 0,
        blocker: blocker?.message ?? null,
        waiting: check.waiting,
        linkValidHours: config.downloadLinkHours,
      };
    },

    /** Marks the order ready and mails the customer the download link, in one transaction. */
    async markReady(actor: User, orderId: number): Promise<Order> {
      const order = await loadOrderFor(db, orderId, actor);
      const check = await checkReady(db, order);
      if (check.blocker) throw check.blocker;
      if (check.waiting.length > 0) {
        throw new AppError(
          'order-not-approved',
          409,
          `Order ${order.id} is not ready: ${check.waiting.map((w) => `roll ${w.rollNumber} ${w.reason}`).join('; ')}.`,
          check.waiting.map((w) => ({
            path: `rolls.${w.rollId}`,
            message: `Roll ${w.rollNumber} ${w.reason}`,
          })),
        );
      }
      if (check.unpaid) throw check.unpaid;
      const customer = (await findUserById(db, order.customer_id))!;
      return db.transaction().execute(async (trx) => {
        const at = clock.now();
        const { token } = await insertDownloadToken(trx, {
          orderId: order.id,
          by: actor.id,
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
        const moved = await moveOrder(trx, {
          orderId: order.id,
          from: order.status,
          to: 'ready',
          actor,
          at,
          details: { because: 'marked ready', mailedTo: customer.email },
        });
        const now = (await findOrderById(trx, order.id))!;
        if (!moved && now.status !== 'ready') {
          throw new AppError(
            'order-moved-meanwhile',
            409,
            `Order ${order.id} became ${now.status} meanwhile; reload it.`,
          );
        }
        return toOrder(now);
      });
    },
  };
}
