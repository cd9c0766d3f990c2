import type { OrderBalance, Quote } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { readPriceList } from '../prices/price-list-store';
import { QuoteError } from '../prices/quote-order';
import { orderBalance } from './order-balance';
import { findOrderForPayment, listOrderPayments } from './payment-repository';
import { priceOrder } from './price-order';

/** An order's balance with the quote behind it (or why the price list cannot price it). */
export interface LoadedBalance {
  balance: OrderBalance;
  quote: Quote | QuoteError;
}

/**
 * The balance of an order as it stands: priced from the price list now, less the payments taken towards it (surplus
 * refunds, settled or still pending, taken off). Undefined when there is no such order.
 *
 * @example
 * const { balance } = (await loadOrderBalance(db, 12))!;
 * if (balance.dueMinor) console.log(`owes ${balance.dueMinor}`);
 */
export async function loadOrderBalance(
  db: Kysely<Database>,
  orderId: number,
): Promise<LoadedBalance | undefined> {
  const order = await findOrderForPayment(db, orderId);
  if (!order) return undefined;
  const quote = await priceOrder(db, order);
  const payments = await listOrderPayments(db, orderId);
  const surplus = await db
    .selectFrom('payment_refunds')
    .innerJoin('payments', 'payments.id', 'payment_refunds.payment_id')
    .select(['payment_refunds.payment_id', 'payment_refunds.amount_minor'])
    .where('payments.order_id', '=', orderId)
    .where('payment_refunds.reason', '=', 'surplus')
    .where('payment_refunds.status', 'in', ['pending', 'succeeded'])
    .execute();
  const surplusOf = (id: number) =>
    surplus.filter((r) => r.payment_id === id).reduce((sum, r) => sum + r.amount_minor, 0);
  const price =
    quote instanceof QuoteError
      ? { totalMinor: null, currency: (await readPriceList(db)).currency }
      : { totalMinor: quote.totalMinor, currency: quote.currency };
  const balance = orderBalance(
    price,
    payments.map((p) => ({
      amountMinor: p.amount_minor,
      status: p.status,
      surplusRefundedMinor: surplusOf(p.id),
    })),
  );
  return { balance, quote };
}
