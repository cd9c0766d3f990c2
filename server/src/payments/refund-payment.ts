import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import Stripe from 'stripe';
import { recordAudit, type AuditAction } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { formatMoney } from '../prices/format-money';
import type { KeyedLock } from './keyed-lock';
import type { PaymentClient } from './payment-client';
import { findPaymentById } from './payment-repository';
import { pendingRefundsOf, reserveRefund, settleRefund } from './payment-refund-repository';
import type { PaymentRefundRow, PaymentRow, RefundReason } from './payment-tables';

export interface RefundDeps {
  db: Kysely<Database>;
  clock: Clock;
  logger: Logger;
  provider: () => PaymentClient;
  /** Shared with everything else that refunds, so one payment's refunds run one at a time. */
  lock: KeyedLock;
}

// the audit module's list names account events; payment actions extend it without editing it
const refundedAction: AuditAction = 'payment-refunded';
const refusedAction: AuditAction = 'payment-refund-refused';

/** True when the provider answered and said no (a 4xx), as opposed to not answering at all. */
function refusedByProvider(err: unknown): err is Stripe.errors.StripeError {
  return (
    err instanceof Stripe.errors.StripeError &&
    typeof err.statusCode === 'number' &&
    err.statusCode >= 400 &&
    err.statusCode < 500
  );
}

const lockKey = (paymentId: number) => `payment:${paymentId}`;

/**
 * Refunds of payments through the provider, so that what a payment records as refunded always equals what the
 * provider refunded. Each refund is first reserved in a transaction that checks what is left (less refunds still
 * reserved), then asked of the provider under the payment's lock with an idempotency key of its own, then settled by
 * the answer. A refund whose answer never came stays reserved and is asked again, with the same key, before the
 * payment's next refund.
 *
 * @example
 * const refunds = createRefunds({ db, clock, logger, provider, lock });
 * await refunds.refund({ paymentId: 3, amountMinor: 500, actor: manager, reason: 'requested' });
 */
export function createRefunds({ db, clock, logger, provider, lock }: RefundDeps) {
  /** Asks the provider for a reserved refund and settles it; the payment as it then stands. */
  async function ask(reservation: PaymentRefundRow, actor: User | null): Promise<PaymentRow> {
    const payment = (await findPaymentById(db, reservation.payment_id))!;
    let providerRefundId: string;
    try {
      const refund = await provider().refunds.create(
        { payment_intent: payment.payment_intent_id!, amount: reservation.amount_minor },
        { idempotencyKey: `refund-${payment.payment_intent_id}-${reservation.id}` },
      );
      providerRefundId = refund.id;
    } catch (err) {
      if (!refusedByProvider(err)) {
        logger.error({ err, paymentId: payment.id, refundId: reservation.id }, 'no answer to a refund');
        throw new AppError(
          'payment-provider-unavailable',
          502,
          'The payment provider did not answer. The refund is held and is asked for again before this payment’s next refund; nothing was refunded twice.',
        );
      }
      await db.transaction().execute(async (trx) => {
        await settleRefund(trx, reservation.id, { status: 'failed', failure: err.message }, clock.now());
        await recordAudit(trx, {
          at: clock.now(),
          actor,
          action: refusedAction,
          target: `order:${payment.order_id}`,
          details: { paymentId: payment.id, amountMinor: reservation.amount_minor, reason: err.message },
        });
      });
      throw new AppError('refund-refused', 502, `The payment provider refused the refund: ${err.message}`);
    }
    return db.transaction().execute(async (trx) => {
      const now = clock.now();
      await settleRefund(trx, reservation.id, { status: 'succeeded', providerRefundId }, now);
      const before = (await findPaymentById(trx, payment.id))!;
      const refunded = before.refunded_minor + reservation.amount_minor;
      const updated = await trx
        .updateTable('payments')
        .set({
          refunded_minor: refunded,
          status: refunded >= before.amount_minor ? 'refunded' : 'partly-refunded',
          updated_at: now.toISOString(),
        })
        .where('id', '=', payment.id)
        .returningAll()
        .executeTakeFirstOrThrow();
      await recordAudit(trx, {
        at: now,
        actor,
        action: refundedAction,
        target: `order:${payment.order_id}`,
        details: {
          paymentId: payment.id,
          amountMinor: reservation.amount_minor,
          currency: payment.currency,
          refundId: providerRefundId,
          reason: reservation.reason,
        },
      });
      return updated;
    });
  }

  /** Asks again for refunds left reserved without an answer (run under the payment's lock, so none is in flight). */
  async function askAgainForHeld(paymentId: number): Promise<void> {
    for (const held of await pendingRefundsOf(db, paymentId)) {
      try {
        await ask(held, null);
      } catch (err) {
        logger.warn({ err, paymentId, refundId: held.id }, 'a held refund is still not settled');
      }
    }
  }

  return {
    /**
     * Refunds part of a paid payment, or all that is left when no amount is given. Throws 404 `payment-not-found`,
     * 409 `not-refundable` (not paid), 409 `refund-too-large` (more than is left, counting refunds under way), 502
     * `refund-refused` with the provider's reason, or 502 `payment-provider-unavailable`.
     */
    refund(input: {
      paymentId: number;
      amountMinor?: number;
      actor: User | null;
      reason: RefundReason;
    }): Promise<PaymentRow> {
      return lock(lockKey(input.paymentId), async () => {
        await askAgainForHeld(input.paymentId);
        const reservation = await db.transaction().execute(async (trx) => {
          const payment = await findPaymentById(trx, input.paymentId);
          if (!payment)
            throw new AppError('payment-not-found', 404, `No payment with id ${input.paymentId}.`);
          if (
            (payment.status !== 'paid' && payment.status !== 'partly-refunded') ||
            !payment.payment_intent_id
          ) {
            throw new AppError(
              'not-refundable',
              409,
              `Payment ${payment.id} is ${payment.status}; only paid payments can be refunded.`,
            );
          }
          const held = (await pendingRefundsOf(trx, payment.id)).reduce((sum, r) => sum + r.amount_minor, 0);
          const left = payment.amount_minor - payment.refunded_minor - held;
          const amount = input.amountMinor ?? left;
          if (amount > left || amount <= 0) {
            throw new AppError(
              'refund-too-large',
              409,
              `At most ${formatMoney(Math.max(0, left), payment.currency)} is left to refund.`,
              [{ path: 'body.amountMinor', message: `Expected at most ${Math.max(0, left)}` }],
            );
          }
          return reserveRefund(trx, {
            paymentId: payment.id,
            amountMinor: amount,
            reason: input.reason,
            by: input.actor?.id ?? null,
            at: clock.now(),
          });
        });
        return ask(reservation, input.actor);
      });
    },

    /** Asks the provider for refunds already reserved (the surplus of a payment, reserved as it was recorded). */
    settleHeld(paymentId: number): Promise<void> {
      return lock(lockKey(paymentId), () => askAgainForHeld(paymentId));
    },
  };
}

export type Refunds = ReturnType<typeof createRefunds>;
