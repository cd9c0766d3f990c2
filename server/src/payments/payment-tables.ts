import type { PaymentStatus } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

/** One checkout of an order at the payment provider; it becomes paid only by the provider's signed event. */
export interface PaymentsTable {
  id: Generated<number>;
  order_id: number;
  checkout_session_id: string;
  amount_minor: number;
  currency: string;
  status: PaymentStatus;
  payment_intent_id: string | null;
  refunded_minor: ColumnType<number, number | undefined, number>;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
  paid_at: string | null;
}

/** Every provider event handled, by its id: an event delivered twice is recognised and changes nothing. */
export interface PaymentEventsTable {
  event_id: string;
  type: string;
  payment_id: number | null;
  received_at: string;
}

export type PaymentRow = Selectable<PaymentsTable>;

/** Why a payment was refunded: staff asked, or it came in for an order already paid (refunded without asking). */
export type RefundReason = 'requested' | 'surplus';

/**
 * One refund of a payment. It is reserved (`pending`) before the provider is asked, so refunds asked for at the same
 * time never add up to more than is left, then settled by the provider's answer: `succeeded` or `failed` with why.
 */
export interface PaymentRefundsTable {
  id: Generated<number>;
  payment_id: number;
  amount_minor: number;
  reason: RefundReason;
  status: 'pending' | 'succeeded' | 'failed';
  provider_refund_id: string | null;
  failure: string | null;
  requested_by: number | null;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
}

export type PaymentRefundRow = Selectable<PaymentRefundsTable>;
