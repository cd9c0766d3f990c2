import type { OrderStatus } from '@clearbase/contracts';
import { AppError } from '../errors/app-error';

/** Statuses an order ends in: nothing moves it on from there. */
export const closedStatuses: readonly OrderStatus[] = ['delivered', 'cancelled'];

export const isClosed = (status: OrderStatus) => closedStatuses.includes(status);

/**
 * Why staff may not move an order from `from` to `to` by hand, as a problem; null when they may. A closed order
 * stays closed; `ready` is reached by marking the order ready, which checks every roll is approved and the order paid
 * and mails the customer; only a ready order is handed over (`delivered`). Any other move, back or forth among the
 * working statuses, or cancelling, is the lab's to make.
 *
 * @example
 * refusalOfStaffMove(7, 'tuning', 'delivered')?.message; // 'Order 7 is tuning; only a ready order can be delivered…'
 */
export function refusalOfStaffMove(orderId: number, from: OrderStatus, to: OrderStatus): AppError | null {
  if (isClosed(from)) {
    return new AppError(
      'order-closed',
      409,
      `Order ${orderId} is ${from} and cannot change status any more.`,
    );
  }
  if (to === 'ready' && from !== 'ready') {
    return new AppError(
      'mark-ready-instead',
      409,
      `Mark order ${orderId} ready from its page: that checks every roll is approved and the order paid, and mails the customer.`,
    );
  }
  if (to === 'delivered' && from !== 'ready') {
    return new AppError(
      'order-not-ready',
      409,
      `Order ${orderId} is ${from}; only a ready order can be delivered. Mark it ready first.`,
    );
  }
  return null;
}
