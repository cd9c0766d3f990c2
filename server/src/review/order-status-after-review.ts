import type { OrderStatus } from '@clearbase/contracts';

/** Statuses an order may become ready from once every roll is approved: work under way, not closed or delivered. */
const readiedByReview: readonly OrderStatus[] = ['developing', 'scanning', 'tuning'];

/**
 * The status a review moves an order to: `ready` once every roll is approved (from developing, scanning or
 * tuning) and payment lets it (paid in full, or the lab takes payment on collection: the rule marking ready follows
 * too), back to `tuning` when a ready order has a roll that no longer is; null when the order stays as it is.
 * @example orderStatusAfterReview('tuning', true, true) // 'ready'
 * @example orderStatusAfterReview('tuning', true, false) // null: it waits for payment, then for marking ready
 */
export function orderStatusAfterReview(
  status: OrderStatus,
  everyRollApproved: boolean,
  paymentLetsReady: boolean,
): OrderStatus | null {
  if (everyRollApproved) return readiedByReview.includes(status) && paymentLetsReady ? 'ready' : null;
  return status === 'ready' ? 'tuning' : null;
}
