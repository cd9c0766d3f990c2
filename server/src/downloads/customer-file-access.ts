import type { OrderStatus, ReviewDecision } from '@clearbase/contracts';
import { formatMoney } from '../prices/format-money';

/** Where an order stands for releasing files to its customer. */
export interface FileReleaseState {
  orderId: number;
  status: OrderStatus;
  /** What is left to pay, in minor units; null when the order cannot be priced from the price list. */
  dueMinor: number | null;
  currency: string;
  /** The lab's setting: customers may pay when they collect, so a ready order is released before it is paid. */
  payOnCollection: boolean;
}

/**
 * What a customer asks for: a gallery thumbnail (small), the 2048 px preview, a full-size output, or the zip (the
 * zip is full-size files of the order; pass the frame's decision as `approved` for the order as a whole).
 */
export type CustomerFileKind = 'thumbnail' | 'preview' | 'full-size';

export type CustomerFileAccess =
  | { allowed: true }
  /** `hidden`: the frame is not for customers at all (answer as missing); `not-released`: not yet, and why. */
  | { allowed: false; refusal: 'hidden' | 'not-released'; reason: string };

const releasedStatuses: readonly OrderStatus[] = ['ready', 'delivered'];

/** Why the order's full-size files are not released yet, or null once they are. */
function notReleasedBecause(order: FileReleaseState): string | null {
  const at = `Order ${order.orderId}`;
  if (!releasedStatuses.includes(order.status)) {
    return `${at} is ${order.status}; its full-size scans come once the lab marks it ready.`;
  }
  if (order.payOnCollection) return null;
  if (order.dueMinor === null) {
    return `${at} has no price from the price list yet; the lab will price it, then its scans can be paid for.`;
  }
  if (order.dueMinor > 0) {
    return `${at} has ${formatMoney(order.dueMinor, order.currency)} left to pay; its full-size scans come once it is paid in full.`;
  }
  return null;
}

/**
 * The one rule of what a customer may get of an order's scans. Frames the lab excluded or rejected, and frames not
 * reviewed yet, are never served. Approved frames show as small thumbnails at any time; the preview, the full-size
 * files and the zip only once the order is ready or delivered and paid in full (ready suffices where the lab takes
 * payment on collection). Staff are not subject to it.
 *
 * @example
 * customerFileAccess({ orderId: 7, status: 'scanning', dueMinor: 2000, currency: 'EUR', payOnCollection: false }, 'approved', 'full-size');
 * // { allowed: false, refusal: 'not-released', reason: 'Order 7 is scanning; its full-size scans come once the lab marks it ready.' }
 */
export function customerFileAccess(
  order: FileReleaseState,
  decision: ReviewDecision | null,
  kind: CustomerFileKind,
): CustomerFileAccess {
  if (decision !== 'approved') {
    return { allowed: false, refusal: 'hidden', reason: 'The lab has not passed this frame for delivery.' };
  }
  if (kind === 'thumbnail') return { allowed: true };
  const reason = notReleasedBecause(order);
  return reason === null ? { allowed: true } : { allowed: false, refusal: 'not-released', reason };
}
