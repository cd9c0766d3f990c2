import type { OrderBalance, PaymentStatus } from '@clearbase/contracts';

/** A payment as the balance counts it. */
export interface BalancePayment {
  amountMinor: number;
  status: PaymentStatus;
  /** Refunded, or being refunded, because it came in for an order already paid: it never counted. */
  surplusRefundedMinor: number;
}

/** Statuses of a payment the provider took; a refunded one was taken too (staff refunds do not reopen a balance). */
const takenStatuses: readonly PaymentStatus[] = ['paid', 'partly-refunded', 'refunded'];

/**
 * What is left to pay on an order: its price from the price list less what was paid towards it. A refund the lab
 * grants is the lab's decision and reopens nothing; a payment refunded as surplus counts for nothing. With no price
 * (the price list cannot price the order) nothing is known to be due.
 *
 * @example
 * orderBalance({ totalMinor: 16500, currency: 'EUR' }, [{ amountMinor: 2000, status: 'paid', surplusRefundedMinor: 0 }]);
 * // { currency: 'EUR', priceMinor: 16500, paidMinor: 2000, dueMinor: 14500 }
 */
export function orderBalance(
  price: { totalMinor: number; currency: string } | { totalMinor: null; currency: string },
  payments: readonly BalancePayment[],
): OrderBalance {
  const paidMinor = payments
    .filter((p) => takenStatuses.includes(p.status))
    .reduce((sum, p) => sum + p.amountMinor - p.surplusRefundedMinor, 0);
  return {
    currency: price.currency,
    priceMinor: price.totalMinor,
    paidMinor,
    dueMinor: price.totalMinor === null ? null : Math.max(0, price.totalMinor - paidMinor),
  };
}

/**
 * How much of a payment just taken is more than the order costs, to refund: at most the payment itself, nothing when
 * the order has no price.
 *
 * @example
 * surplusOf({ currency: 'EUR', priceMinor: 2000, paidMinor: 4000, dueMinor: 0 }, 2000); // 2000
 */
export function surplusOf(balance: OrderBalance, paymentMinor: number): number {
  if (balance.priceMinor === null) return 0;
  return Math.min(paymentMinor, Math.max(0, balance.paidMinor - balance.priceMinor));
}
