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
