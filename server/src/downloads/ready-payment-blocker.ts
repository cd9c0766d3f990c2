import { formatMoney } from '../prices/format-money';
import type { FileReleaseState } from './customer-file-access';

/**
 * Why payment keeps an order from being marked ready, or null: marking it ready sends the customer a link to the
 * full-size scans, which customerFileAccess releases only once the order is paid in full, unless the lab takes payment
 * on collection.
 *
 * @example
 * readyPaymentBlocker({ orderId: 7, status: 'tuning', dueMinor: 10000, currency: 'EUR', payOnCollection: false });
 * // 'Order 7 has €100.00 left to pay; it can be marked ready once that is paid.'
 */
export function readyPaymentBlocker(order: FileReleaseState): string | null {
  if (order.payOnCollection) return null;
  if (order.dueMinor === null) {
    return `Order ${order.orderId} cannot be priced from the price list; price what it asks for, or take payment on collection.`;
  }
  if (order.dueMinor > 0) {
    return `Order ${order.orderId} has ${formatMoney(order.dueMinor, order.currency)} left to pay; it can be marked ready once that is paid.`;
  }
  return null;
}
