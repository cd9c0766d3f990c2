import { readNegatives } from '../orders/order-repository';
import type { Payment } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { PaymentRow } from './payment-tables';

export function toPayment(row: PaymentRow): Payment {
  return {
    id: row.id,
    orderId: row.order_id,
    amountMinor: row.amount_minor,
    currency: row.currency,
    status: row.status,
    refundedMinor: row.refunded_minor,
    createdAt: row.created_at,
    paidAt: row.paid_at,
  };
}

export function findPaymentById(db: Kysely<Database>, id: number): Promise<PaymentRow | undefined> {
  return db.selectFrom('payments').selectAll().where('id', '=', id).executeTakeFirst();
}

export function findPaymentBySession(
  db: Kysely<Database>,
  sessionId: string,
): Promise<PaymentRow | undefined> {
  return db
    .selectFrom('payments')
    .selectAll()
    .where('checkout_session_id', '=', sessionId)
    .executeTakeFirst();
}

export function listOrderPayments(db: Kysely<Database>, orderId: number): Promise<PaymentRow[]> {
  return db.selectFrom('payments').selectAll().where('order_id', '=', orderId).orderBy('id').execute();
}

/** Records that an event was handled; false when it had been already (a replay), and then nothing else may change. */
export async function claimPaymentEvent(
  db: Kysely<Database>,
  event: { id: string; type: string; paymentId: number | null; receivedAt: string },
): Promise<boolean> {
  const result = await db
    .insertInto('payment_events')
    .values({
      event_id: event.id,
      type: event.type,
      payment_id: event.paymentId,
      received_at: event.receivedAt,
    })
    .onConflict((oc) => oc.column('event_id').doNothing())
    .executeTakeFirst();
  return Number(result.numInsertedOrUpdatedRows ?? 0n) === 1;
}

/** The owner and the parts that set the price of an order, or undefined when there is no such order. */
export async function findOrderForPayment(db: Kysely<Database>, orderId: number) {
  const order = await db
    .selectFrom('orders')
    .innerJoin('users', 'users.id', 'orders.customer_id')
    .select([
      'orders.id',
      'orders.customer_id',
      'orders.scan_size',
      'orders.status',
      'orders.negatives',
      'orders.price_list',
      'users.email as customer_email',
      'users.name as customer_name',
    ])
    .where('orders.id', '=', orderId)
    .executeTakeFirst();
  if (!order) return undefined;
  const rolls = await db
    .selectFrom('rolls')
    .innerJoin('stocks', 'stocks.id', 'rolls.stock_id')
    .select(['rolls.format', 'rolls.push_pull', 'stocks.process'])
    .where('rolls.order_id', '=', orderId)
    .orderBy('rolls.id')
    .execute();
  return { ...order, negatives: readNegatives(order.negatives), rolls };
}
