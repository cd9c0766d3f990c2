import { refundRequestSchema } from '@clearbase/contracts';
import type Stripe from 'stripe';
import { z } from 'zod';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { createPaymentClient, type PaymentClient } from './payment-client';
import { toPayment } from './payment-repository';
import { createPaymentsService } from './payments-service';
import { paymentWebhookPath, rawBodyOf } from './raw-body';

const idParams = z.object({ id: z.coerce.number().int().positive('Expected a positive id') });

/**
 * Paying for an order through the provider's checkout, confirmed only by its signed event, and staff refunds. The SDK
 * is pointed at PAYMENT_API_BASE, which main.ts fills in with the local fake's address when local fakes run.
 */
export const paymentsRoutes: RouteModule = (api, { db, clock, config, logger }) => {
  let client: PaymentClient | undefined;
  const provider = () => (client ??= createPaymentClient(config.payment));
  const payments = createPaymentsService({ db, clock, logger, provider, publicUrl: config.publicUrl });

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
        event = provider().webhooks.constructEvent(raw, signature, config.payment.webhookSecret);
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
      const outcome = await payments.applyEvent(event);
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
      summary:
        'Pay what is left on my order on the provider’s page (201 a new checkout, 200 the open one again)',
    },
    async (_req, res, { params, user }) => {
      const { payment, checkoutUrl, reused } = await payments.checkout(user!, params.id);
      res.status(reused ? 200 : 201).json({ payment: toPayment(payment), checkoutUrl });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/orders/:id/payments',
      roles: 'signed-in',
      params: idParams,
      summary: 'The payments of an order and what is left to pay (its customer or staff)',
    },
    async (_req, res, { params, user }) => {
      res.json(await payments.paymentsOf(user!, params.id));
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/payments/:id/refund',
      roles: ['manager', 'admin'],
      params: idParams,
      body: refundRequestSchema,
      summary: 'Refund a paid payment, in full or in part, through the provider (409 past what is left)',
    },
    async (_req, res, { params, body, user }) => {
      const payment = await payments.refund(user!, params.id, body.amountMinor);
      res.json({ payment: toPayment(payment) });
    },
  );
};
