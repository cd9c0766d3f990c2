import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { PaymentRefundRow, RefundReason } from './payment-tables';

/** Reserves a refund of a payment before the provider is asked: it counts against what is left from now on. */
export function reserveRefund(
  db: Kysely<Database>,
  refund: { paymentId: number; amountMinor: number; reason: RefundReason; by: number | null; at: Date },
): Promise<PaymentRefundRow> {
  const at = refund.at.toISOString();
  return db
    .insertInto('payment_refunds')
    .values({
      payment_id: refund.paymentId,
      amount_minor: refund.amountMinor,
      reason: refund.reason,
      status: 'pending',
      provider_refund_id: null,
      failure: null,
      requested_by: refund.by,
      created_at: at,
      updated_at: at,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** A payment's refunds still waiting for the provider's answer, oldest first. */
export function pendingRefundsOf(db: Kysely<Database>, paymentId: number): Promise<PaymentRefundRow[]> {
  return db
    .selectFrom('payment_refunds')
    .selectAll()
    .where('payment_id', '=', paymentId)
    .where('status', '=', 'pending')
    .orderBy('id')
    .execute();
}

/** Settles a reserved refund with the provider's answer. */
export async function settleRefund(
  db: Kysely<Database>,
  id: number,
  outcome: { status: 'succeeded'; providerRefundId: string } | { status: 'failed'; failure: string },
  at: Date,
): Promise<void> {
  await db
    .updateTable('payment_refunds')
    .set({
      status: outcome.status,
      provider_refund_id: outcome.status === 'succeeded' ? outcome.providerRefundId : null,
      failure: outcome.status === 'failed' ? outcome.failure : null,
      updated_at: at.toISOString(),
    })
    .where('id', '=', id)
    .execute();
}
