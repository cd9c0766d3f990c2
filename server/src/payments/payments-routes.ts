import {
  filmProcessSchema,
  refundRequestSchema,
  scanSizeSchema,
  type OrderDraft,
  type User,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type Stripe from 'stripe';
import { z } from 'zod';
import { recordAudit, type AuditAction } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { formatMoney } from '../prices/format-money';
import { readPriceList } from '../prices/price-list-store';
import { QuoteError, quoteOrder } from '../prices/quote-order';
import { createPaymentClient, type PaymentClient } from './payment-client';
import {
  claimPaymentEvent,
  findOrderForPayment,
  findPaymentById,
  findPaymentBySession,
  listOrderPayments,
  toPayment,
} from './payment-repository';
import { paymentWebhookPath, rawBodyOf } from './raw-body';

const idParams = z.object({ id: z.coerce.number().int().positive('Expected a positive id') });

function orderNotFound(id: number): AppError {
  return new AppError('order-not-found', 404, `No order with id ${id}.`);
}

/** The order if this user may see it; someone else's order answers as one that does not exist. */
async function orderFor(db: Kysely<Database>, id: number, user: User) {
  const order = await findOrderForPayment(db, id);
  if (!order || (user.role === 'customer' && order.customer_id !== user.id)) throw orderNotFound(id);
  return order;
}

/** Applies one verified provider event; returns what it changed, for the log. */
async function applyEvent(db: Kysely<Database>, event: Stripe.Event, clock: Clock): Promise<string> {
  const now = clock.now().toISOString();
  const session =
    event.type === 'checkout.session.completed' || event.type === 'checkout.session.expired'
      ? (event.data.object as Stripe.Checkout.Session)
      : null;
  return db.transaction().execute(async (trx) => {
    const payment = session ? await findPaymentBySession(trx, session.id) : undefined;
    const fresh = await claimPaymentEvent(trx, {
      id: event.id,
      type: event.type,
      paymentId: payment?.id ?? null,
      receivedAt: now,
    });
    if (!fresh) return 'replay';
    if (!session) return 'ignored';
    if (!payment) return 'unknown-session';
    if (payment.status !== 'open') return 'already-settled';
    if (event.type === 'checkout.session.expired') {
      await trx
        .updateTable('payments')
        .set({ status: 'declined', updated_at: now })
        .where('id', '=', payment.id)
        .execute();
      return 'declined';
    }
    if (
      session.payment_status !== 'paid' ||
      session.amount_total !== payment.amount_minor ||
      session.currency?.toUpperCase() !== payment.currency
    ) {
      return 'mismatch';
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
    const order = await findOrderForPayment(trx, payment.order_id);
    if (order) {
      await enqueueTemplatedMail(
        trx,
        order.customer_email,
        'payment-receipt',
        {
          name: order.customer_name,
          amount: formatMoney(payment.amount_minor, payment.currency),
          reference: `order ${order.id}`,
        },
        clock.now(),
      );
    }
    return 'paid';
  });
}

/**
 * Paying for an order through the provider's checkout, confirmed only by its signed event, and staff refunds. The SDK
 * is pointed at PAYMENT_API_BASE, which main.ts fills in with the local fake's address when local fakes run.
 */
export const paymentsRoutes: RouteModule = (api, { db, clock, config, logger }) => {
  let client: PaymentClient | undefined;
  const payments = () => (client ??= createPaymentClient(config.payment));

  api.define(
    {
      method: 'post',
      path: paymentWebhookPath,
      roles: 'public',
      summary: 'Signed events from the payment provider (checkout completed or expired)',
    },
    async (req, res) => {
      const raw = rawBodyOf(req);
      const signature = req.get('stripe-signature');
      let event: Stripe.Event;
      try {
        if (!raw || !signature) throw new Error('no signed JSON body');
        event = payments().webhooks.constructEvent(raw, signature, config.payment.webhookSecret);
      } catch (err) {
        logger.warn(
          { err: err instanceof Error ? err.message : String(err), ip: req.ip },
          'refused a payment event with a bad signature',
        );
        throw new AppError(
          'bad-signature',
          400,
          'The payment event’s signature does not verify; nothing was changed.',
        );
      }
      const outcome = await applyEvent(db, event, clock);
      logger.info({ eventId: event.id, type: event.type, outcome }, 'payment event handled');
      res.json({ received: true, outcome });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/orders/:id/checkout',
      roles: ['customer'],
      params: idParams,
      summary: 'Start paying for my order: the price from the price list, paid on the provider’s page',
    },
    async (_req, res, { params, user }) => {
      const order = await orderFor(db, params.id, user!);
      if (!order.rolls.length)
        throw new AppError('order-empty', 409, 'Add a roll to the order before paying.');
      const existing = await listOrderPayments(db, order.id);
      if (existing.some((p) => p.status === 'paid' || p.status === 'partly-refunded')) {
        throw new AppError('order-paid', 409, `Order ${order.id} is already paid.`);
      }
      const draft: OrderDraft = {
        scanSize: scanSizeSchema.parse(order.scan_size),
        rolls: order.rolls.map((r) => ({
          format: r.format,
          process: filmProcessSchema.parse(r.process),
          pushPull: r.push_pull,
        })),
        negatives: order.negatives.method,
      };
      let quote;
      try {
        quote = quoteOrder(await readPriceList(db), draft);
      } catch (err) {
        if (err instanceof QuoteError) {
          throw new AppError('no-price', 422, `${err.message} The lab will price this order by hand.`);
        }
        throw err;
      }
      const back = `${config.publicUrl}/orders/${order.id}`;
      const session = await payments().checkout.sessions.create({
        mode: 'payment',
        client_reference_id: `order:${order.id}`,
        customer_email: order.customer_email,
        metadata: { orderId: String(order.id) },
        success_url: `${back}?payment=done`,
        cancel_url: `${back}?payment=cancelled`,
        line_items: quote.lines.map((line) => ({
          quantity: 1,
          price_data: {
            currency: quote.currency.toLowerCase(),
            unit_amount: line.amountMinor,
            product_data: {
              name: line.rollIndex === null ? line.label : `Roll ${line.rollIndex + 1}: ${line.label}`,
            },
          },
        })),
      });
      if (!session.url) throw new Error('the payment provider gave no checkout address');
      const now = clock.now().toISOString();
      const row = await db
        .insertInto('payments')
        .values({
          order_id: order.id,
          checkout_session_id: session.id,
          amount_minor: quote.totalMinor,
          currency: quote.currency,
          status: 'open',
          payment_intent_id: null,
          created_at: now,
          updated_at: now,
          paid_at: null,
        })
        .returningAll()
        .executeTakeFirstOrThrow();
      res.status(201).json({ payment: toPayment(row), checkoutUrl: session.url });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/orders/:id/payments',
      roles: 'signed-in',
      params: idParams,
      summary: 'The payments of an order (its customer or staff)',
    },
    async (_req, res, { params, user }) => {
      const order = await orderFor(db, params.id, user!);
      res.json({ payments: (await listOrderPayments(db, order.id)).map(toPayment) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/payments/:id/refund',
      roles: ['manager', 'admin'],
      params: idParams,
      body: refundRequestSchema,
      summary: 'Refund a paid payment, in full or in part, through the provider',
    },
    async (_req, res, { params, body, user }) => {
      const payment = await findPaymentById(db, params.id);
      if (!payment) throw new AppError('payment-not-found', 404, `No payment with id ${params.id}.`);
      if ((payment.status !== 'paid' && payment.status !== 'partly-refunded') || !payment.payment_intent_id) {
        throw new AppError(
          'not-refundable',
          409,
          `Payment ${payment.id} is ${payment.status}; only paid payments can be refunded.`,
        );
      }
      const left = payment.amount_minor - payment.refunded_minor;
      const amount = body.amountMinor ?? left;
      if (amount > left) {
        throw new AppError(
          'refund-too-large',
          400,
          `At most ${formatMoney(left, payment.currency)} is left to refund.`,
          [{ path: 'body.amountMinor', message: `Expected at most ${left}` }],
        );
      }
      const refund = await payments().refunds.create({ payment_intent: payment.payment_intent_id, amount });
      const refunded = payment.refunded_minor + amount;
      const row = await db.transaction().execute(async (trx) => {
        const updated = await trx
          .updateTable('payments')
          .set({
            refunded_minor: refunded,
            status: refunded >= payment.amount_minor ? 'refunded' : 'partly-refunded',
            updated_at: clock.now().toISOString(),
          })
          .where('id', '=', payment.id)
          .returningAll()
          .executeTakeFirstOrThrow();
        await recordAudit(trx, {
          at: clock.now(),
          actor: user!,
          // the audit module's list names account events; payment actions extend it without editing it
          action: 'payment-refunded' as string as AuditAction,
          target: `order:${payment.order_id}`,
          details: {
            paymentId: payment.id,
            amountMinor: amount,
            currency: payment.currency,
            refundId: refund.id,
          },
        });
        return updated;
      });
      res.json({ payment: toPayment(row) });
    },
  );
};
