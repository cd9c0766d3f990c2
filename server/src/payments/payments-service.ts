import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import type Stripe from 'stripe';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { applyPaymentEvent, type PaymentEventOutcome } from './apply-payment-event';
import { checkoutOrder, type Checkout } from './checkout-order';
import { createKeyedLock } from './keyed-lock';
import { loadOrderBalance } from './load-order-balance';
import type { PaymentClient } from './payment-client';
import { findOrderForPayment, listOrderPayments, toPayment } from './payment-repository';
import type { PaymentRow } from './payment-tables';
import { createRefunds } from './refund-payment';

export interface PaymentsServiceDeps {
  db: Kysely<Database>;
  clock: Clock;
  logger: Logger;
  /** The provider's SDK client, made on first use (its address may be known only once the local fake listens). */
  provider: () => PaymentClient;
  publicUrl: string;
}

/**
 * Paying for orders and refunding payments, with the rules in one place: checkout charges what is left to pay, one
 * open checkout per order; a payment the order did not need is refunded at once; refunds of one payment run one at a
 * time and never add up to more than was paid.
 *
 * @example
 * const payments = createPaymentsService({ db, clock, logger, provider, publicUrl });
 * const { checkoutUrl } = await payments.checkout(user, orderId);
 */
export function createPaymentsService(deps: PaymentsServiceDeps) {
  const { db, clock, logger, provider } = deps;
  const lock = createKeyedLock();
  const refunds = createRefunds({ db, clock, logger, provider, lock });

  /** The order if this user may see it; someone else's order answers as one that does not exist. */
  async function orderFor(orderId: number, user: User) {
    const order = await findOrderForPayment(db, orderId);
    if (!order || (user.role === 'customer' && order.customer_id !== user.id)) {
      throw new AppError('order-not-found', 404, `No order with id ${orderId}.`);
    }
    return order;
  }

  return {
    /** Opens (or hands out again) the checkout for what is left to pay on the user's order. */
    async checkout(user: User, orderId: number): Promise<Checkout> {
      return checkoutOrder(
        { db, clock, provider, lock, publicUrl: deps.publicUrl },
        await orderFor(orderId, user),
      );
    },

    /** The order's payments and its balance, for its customer or staff. */
    async paymentsOf(user: User, orderId: number) {
      const order = await orderFor(orderId, user);
      const { balance } = (await loadOrderBalance(db, order.id))!;
      return { payments: (await listOrderPayments(db, order.id)).map(toPayment), balance };
    },

    /** A staff refund of part or all that is left of a payment. */
    refund(actor: User, paymentId: number, amountMinor: number | undefined): Promise<PaymentRow> {
      return refunds.refund({ paymentId, amountMinor, actor, reason: 'requested' });
    },

    /** Applies one verified provider event. */
    applyEvent(event: Stripe.Event): Promise<PaymentEventOutcome> {
      return applyPaymentEvent({ db, clock, refunds }, event);
    },
  };
}

export type PaymentsService = ReturnType<typeof createPaymentsService>;
