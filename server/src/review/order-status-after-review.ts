import type { OrderStatus } from '@clearbase/contracts';

/** Statuses an order may become ready from once every roll is approved: work under way, not closed or delivered. */
const readiedByReview: readonly OrderStatus[] = ['developing', 'scanning', 'tuning'];

/**
 * The status a review moves an order to: `ready` once every roll is approved (from developing, scanning or
 * tuning), back to `tuning` when a ready order has a roll that no longer is; null when the order stays as it is.
 * @example orderStatusAfterReview('tuning', true) // 'ready'
 */
export function orderStatusAfterReview(status: OrderStatus, everyRollApproved: boolean): OrderStatus | null {
  if (everyRollApproved) return readiedByReview.includes(status) ? 'ready' : null;
  return status === 'ready' ? 'tuning' : null;
}
