import type { OrderBalance, OrderStatus } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { readLab } from '../lab/lab-settings';
import { loadOrderBalance } from '../payments/load-order-balance';
import type { FileReleaseState } from './customer-file-access';

/**
 * What customerFileAccess needs to know of an order: its status, what is left to pay, and whether the lab takes
 * payment on collection; with the balance itself, for showing.
 *
 * @example
 * const { state } = await loadFileRelease(db, order);
 * customerFileAccess(state, 'approved', 'full-size');
 */
export async function loadFileRelease(
  db: Kysely<Database>,
  order: { id: number; status: OrderStatus },
): Promise<{ state: FileReleaseState; balance: OrderBalance }> {
  const loaded = await loadOrderBalance(db, order.id);
  if (!loaded) throw new Error(`order ${order.id} vanished while its files were asked for`);
  const { balance } = loaded;
  const lab = await readLab(db);
  return {
    balance,
    state: {
      orderId: order.id,
      status: order.status,
      dueMinor: balance.dueMinor,
      currency: balance.currency,
      payOnCollection: lab.payOnCollection,
    },
  };
}
