import type { OrderStatus, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { recordAudit } from '../audit/audit-log';
import { setOrderStatusIf } from './order-repository';

/** One change of an order's status, by a person or (actor null) by the system. */
export interface OrderMove {
  orderId: number;
  /** The status the caller saw: the order moves only if it is still in it. */
  from: OrderStatus;
  to: OrderStatus;
  actor: User | null;
  at: Date;
  /** Why, for the audit log, e.g. `{ because: 'marked ready', mailedTo }`. */
  details?: Record<string, unknown>;
}

/**
 * The one way an order's status changes: moves it from `from` to `to` if it is still in `from`, so a concurrent
 * change is never overwritten, and audits the change in the same transaction. Returns false when the order had
 * moved on meanwhile (nothing written), or when `from` is `to`.
 *
 * @example
 * await db.transaction().execute((trx) => moveOrder(trx, { orderId: 7, from: 'tuning', to: 'ready', actor: user, at }));
 */
export async function moveOrder(trx: Kysely<Database>, move: OrderMove): Promise<boolean> {
  if (move.from === move.to) return false;
  if (!(await setOrderStatusIf(trx, move.orderId, move.from, move.to, move.at))) return false;
  await recordAudit(trx, {
    at: move.at,
    actor: move.actor ? { id: move.actor.id, email: move.actor.email } : null,
    action: 'order-status-changed',
    target: `order:${move.orderId}`,
    details: {
      before: move.from,
      after: move.to,
      ...(move.actor ? {} : { by: 'system' }),
      ...move.details,
    },
  });
  return true;
}
