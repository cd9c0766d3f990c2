import type Stripe from 'stripe';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { formatMoney } from '../prices/format-money';
import { QuoteError } from '../prices/quote-order';
import type { KeyedLock } from './keyed-lock';
import { loadOrderBalance } from './load-order-balance';
import type { PaymentClient } from './payment-client';
import { listOrderPayments } from './payment-repository';
import type { PaymentRow } from './payment-tables';
import type { OrderForPayment } from './price-order';

export interface CheckoutDeps {
  db: Kysely<Database>;
  clock: Clock;
  provider: () => PaymentClient;
  lock: KeyedLock;
  publicUrl: string;
}

export interface Checkout {
  payment: PaymentRow;
  checkoutUrl: string;
  /** True when an open checkout for the same amount was handed out again instead of a new one. */
  reused: boolean;
}

async function markDeclined(db: Kysely<Database>, payment: PaymentRow, at: Date): Promise<void> {
  await db
    .updateTable('payments')
    .set({ status: 'declined', updated_at: at.toISOString() })
    .where('id', '=', payment.id)
    .where('status', '=', 'open')
    .execute();
}

const confirming = (orderId: number) =>
  new AppError(
    'payment-confirming',
    409,
    `A payment for order ${orderId} has just been made and is being confirmed; look again in a minute.`,
  );

/**
 * Checking out an order charges exactly what is left to pay. One checkout is open per order at a time: asked again for
 * the same amount (a second tab), the open one is handed out again; for another amount (rolls added since) the earlier
 * one is expired at the provider first, so it can no longer be paid. Run per order one at a time.
 *
 * @example
 * const { checkoutUrl } = await checkoutOrder(deps, order);
 */
export function checkoutOrder(deps: CheckoutDeps, order: OrderForPayment): Promise<Checkout> {
  const { db, clock, provider } = deps;
  return deps.lock(`order:${order.id}`, async () => {
    if (!order.rolls.length) throw new AppError('order-empty', 409, 'Add a roll to the order before paying.');
    const { balance, quote } = (await loadOrderBalance(db, order.id))!;
    if (quote instanceof QuoteError) {
      throw new AppError('no-price', 422, `${quote.message} The lab will price this order by hand.`);
    }
    const due = balance.dueMinor!;
    if (due <= 0) throw new AppError('order-paid', 409, `Order ${order.id} is already paid.`);

    for (const open of (await listOrderPayments(db, order.id)).filter((p) => p.status === 'open')) {
      const session = await provider().checkout.sessions.retrieve(open.checkout_session_id);
      if (session.status === 'complete') throw confirming(order.id);
      if (session.status === 'open' && open.amount_minor === due && session.url) {
        return { payment: open, checkoutUrl: session.url, reused: true };
      }
      if (session.status === 'open') {
        try {
          await provider().checkout.sessions.expire(session.id);
        } catch (err) {
          // paid in the other tab a moment ago: its event is on its way
          const now = await provider().checkout.sessions.retrieve(session.id);
          if (now.status === 'complete') throw confirming(order.id);
          if (now.status === 'open') throw err;
        }
      }
      await markDeclined(db, open, clock.now());
    }

    const back = `${deps.publicUrl}/orders/${order.id}`;
    const currency = quote.currency.toLowerCase();
    const lines: Stripe.Checkout.SessionCreateParams.LineItem[] =
      balance.paidMinor === 0
        ? quote.lines.map((line) => ({
            quantity: 1,
            price_data: {
              currency,
              unit_amount: line.amountMinor,
              product_data: {
                name: line.rollIndex === null ? line.label : `Roll ${line.rollIndex + 1}: ${line.label}`,
              },
            },
          }))
        : [
            {
              quantity: 1,
              price_data: {
                currency,
                unit_amount: due,
                product_data: {
                  name: `Balance of order ${order.id}`,
                  description: `${formatMoney(balance.priceMinor!, quote.currency)} less ${formatMoney(balance.paidMinor, quote.currency)} paid`,
                },
              },
            },
          ];
    const session = await provider().checkout.sessions.create({
      mode: 'payment',
      client_reference_id: `order:${order.id}`,
      customer_email: order.customer_email,
      metadata: { orderId: String(order.id) },
      success_url: `${back}?payment=done`,
      cancel_url: `${back}?payment=cancelled`,
      line_items: lines,
    });
    if (!session.url) throw new Error('the payment provider gave no checkout address');
    const now = clock.now().toISOString();
    const payment = await db
      .insertInto('payments')
      .values({
        order_id: order.id,
        checkout_session_id: session.id,
        amount_minor: due,
        currency: quote.currency,
        status: 'open',
        payment_intent_id: null,
        created_at: now,
        updated_at: now,
        paid_at: null,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    return { payment, checkoutUrl: session.url, reused: false };
  });
}
