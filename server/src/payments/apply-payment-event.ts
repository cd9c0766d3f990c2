import type { Kysely } from 'kysely';
import type Stripe from 'stripe';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { formatMoney } from '../prices/format-money';
import { loadOrderBalance } from './load-order-balance';
import { surplusOf } from './order-balance';
import { reserveRefund } from './payment-refund-repository';
import { claimPaymentEvent, findOrderForPayment, findPaymentBySession } from './payment-repository';
import type { Refunds } from './refund-payment';

/** What handling one event did, for the log and the provider's answer. */
export type PaymentEventOutcome =
  | 'replay'
  | 'ignored'
  | 'unknown-session'
  | 'already-settled'
  | 'declined'
  | 'mismatch'
  | 'paid'
  | 'paid-surplus-refunded'
  | 'paid-surplus-refund-failed';

/**
 * Applies one verified provider event, once (a replay changes nothing). A completed checkout marks its payment paid
 * and mails a receipt; whatever of it the order did not need — the order was paid already, by another tab — is
 * reserved for refund in the same transaction and refunded at once, on the record, never kept silently.
 *
 * @example
 * const outcome = await applyPaymentEvent({ db, clock, refunds }, event); // 'paid'
 */
export async function applyPaymentEvent(
  { db, clock, refunds }: { db: Kysely<Database>; clock: Clock; refunds: Refunds },
  event: Stripe.Event,
): Promise<PaymentEventOutcome> {
  const now = clock.now().toISOString();
  const session =
    event.type === 'checkout.session.completed' || event.type === 'checkout.session.expired'
      ? (event.data.object as Stripe.Checkout.Session)
      : null;
  const applied = await db.transaction().execute(async (trx) => {
    const payment = session ? await findPaymentBySession(trx, session.id) : undefined;
    const fresh = await claimPaymentEvent(trx, {
      id: event.id,
      type: event.type,
      paymentId: payment?.id ?? null,
      receivedAt: now,
    });
    if (!fresh) return { outcome: 'replay' as const };
    if (!session) return { outcome: 'ignored' as const };
    if (!payment) return { outcome: 'unknown-session' as const };
    if (
      payment.status !== 'open' &&
      !(payment.status === 'declined' && event.type === 'checkout.session.completed')
    ) {
      return { outcome: 'already-settled' as const };
    }
    if (event.type === 'checkout.session.expired') {
      await trx
        .updateTable('payments')
        .set({ status: 'declined', updated_at: now })
        .where('id', '=', payment.id)
        .execute();
      return { outcome: 'declined' as const };
    }
    if (
      session.payment_status !== 'paid' ||
      session.amount_total !== payment.amount_minor ||
      session.currency?.toUpperCase() !== payment.currency
    ) {
      return { outcome: 'mismatch' as const };
    }
    const intent =
      typeof session.payment_intent === 'string'
        ? session.payment_intent
        : (session.payment_intent?.id ?? null);
    await trx
      .updateTable('payments')
      .set({ status: 'paid', payment_intent_id: intent, paid_at: now, updated_at: now })
      .where('id', '=', payment.id)
      .execute();
    const { balance } = (await loadOrderBalance(trx, payment.order_id))!;
    const surplus = intent ? surplusOf(balance, payment.amount_minor) : 0;
    if (surplus > 0) {
      await reserveRefund(trx, {
        paymentId: payment.id,
        amountMinor: surplus,
        reason: 'surplus',
        by: null,
        at: clock.now(),
      });
    }
    const kept = payment.amount_minor - surplus;
    const order = await findOrderForPayment(trx, payment.order_id);
    if (order && kept > 0) {
      await enqueueTemplatedMail(
        trx,
        order.customer_email,
        'payment-receipt',
        {
          name: order.customer_name,
          amount: formatMoney(kept, payment.currency),
          reference: `order ${order.id}`,
        },
        clock.now(),
      );
    }
    return { outcome: 'paid' as const, surplusOf: surplus > 0 ? payment.id : null };
  });
  if (applied.outcome !== 'paid' || applied.surplusOf === null) return applied.outcome;
  await refunds.settleHeld(applied.surplusOf);
  const failed = await db
    .selectFrom('payment_refunds')
    .select('id')
    .where('payment_id', '=', applied.surplusOf)
    .where('reason', '=', 'surplus')
    .where('status', '!=', 'succeeded')
    .executeTakeFirst();
  return failed ? 'paid-surplus-refund-failed' : 'paid-surplus-refunded';
}
