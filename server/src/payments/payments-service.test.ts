import type { User } from '@clearbase/contracts';
import { pino } from 'pino';
import type Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { createOrdersService } from '../orders/orders-service';
import { startPaymentFake, type RunningPaymentFake } from '../payment-fake/start-payment-fake';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createPaymentClient } from './payment-client';
import { createPaymentsService, type PaymentsService } from './payments-service';

const secretKey = 'sk_test_payments_service';
const webhookSecret = 'whsec_payments_service';
// starter price list: 12.00 develop + 8.00 scan for a 135-36 C-41 roll at standard size
const rollMinor = 2000;

let t: TestApp;
let fake: RunningPaymentFake;
let payments: PaymentsService;
let customer: User;
let stranger: User;
let manager: User;
let stockId: number;

const asUser = async (role: User['role'], email: string): Promise<User> => ({
  id: await addUser(t.db, role, email),
  email,
  name: `Test ${role}`,
  role,
});

beforeAll(async () => {
  // the fake's own event posts go nowhere; the tests apply the events themselves
  fake = await startPaymentFake({
    secretKey,
    webhookSecret,
    webhookUrl: 'http://127.0.0.1:1/unused',
    logger: pino({ level: 'silent' }),
  });
  t = await createTestApp({
    PUBLIC_URL: 'http://scans.lab.test',
    PAYMENT_API_BASE: fake.url,
    PAYMENT_SECRET_KEY: secretKey,
    PAYMENT_WEBHOOK_SECRET: webhookSecret,
  });
  customer = await asUser('customer', 'payer@example.test');
  stranger = await asUser('customer', 'other@example.test');
  manager = await asUser('manager', 'boss@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  const provider = createPaymentClient(t.config.payment);
  payments = createPaymentsService({
    db: t.db,
    clock: t.clock,
    logger: pino({ level: 'silent' }),
    provider: () => provider,
    publicUrl: t.config.publicUrl,
  });
});
afterAll(async () => {
  await t.close();
  await fake.stop();
});

async function orderOfRolls(rolls: number): Promise<number> {
  const order = await createOrdersService({ db: t.db, clock: t.clock, config: t.config }).place(customer, {
    outputFormats: ['jpeg'],
    scanSize: 'standard',
    notes: '',
    rolls: Array.from({ length: rolls }, () => ({
      stockId,
      ei: 200,
      pushPull: 0,
      format: '135-36',
      scannerId: null,
    })),
  } as never);
  return order.id;
}

const sessionOf = (checkoutUrl: string) => new URL(checkoutUrl).pathname.split('/').at(-1)!;

/** The customer approves the checkout on the provider's page, and its completed event is applied. */
async function pay(checkoutUrl: string): Promise<string> {
  const sessionId = sessionOf(checkoutUrl);
  const approve = await fetch(`${fake.url}/checkout/${sessionId}/approve`, {
    method: 'POST',
    redirect: 'manual',
  });
  expect(approve.status).toBe(303);
  return payments.applyEvent(completed(sessionId));
}

const completed = (sessionId: string) =>
  ({
    id: `evt_paid_${sessionId}`,
    object: 'event',
    type: 'checkout.session.completed',
    data: { object: fake.sessions.get(sessionId) },
  }) as unknown as Stripe.Event;

async function paidOrder(rolls: number): Promise<{ orderId: number; paymentId: number; sessionId: string }> {
  const orderId = await orderOfRolls(rolls);
  const { payment, checkoutUrl } = await payments.checkout(customer, orderId);
  expect(await pay(checkoutUrl)).toBe('paid');
  return { orderId, paymentId: payment.id, sessionId: sessionOf(checkoutUrl) };
}

describe('checking out', () => {
  it('opens a checkout at the provider for what the order owes, one line a roll', async () => {
    const orderId = await orderOfRolls(2);

    const { payment, checkoutUrl, reused } = await payments.checkout(customer, orderId);

    expect(reused).toBe(false);
    expect(payment).toMatchObject({ order_id: orderId, amount_minor: 2 * rollMinor, status: 'open' });
    const session = fake.sessions.get(sessionOf(checkoutUrl))!;
    expect(session.amount_total).toBe(2 * rollMinor);
    // develop and scan for each roll, each line naming its roll
    expect(session.line_items_summary.map((l) => l.name.split(':')[0])).toEqual([
      'Roll 1',
      'Roll 1',
      'Roll 2',
      'Roll 2',
    ]);
  });

  it('hands out the open checkout again instead of opening a second', async () => {
    const orderId = await orderOfRolls(1);
    const first = await payments.checkout(customer, orderId);

    const second = await payments.checkout(customer, orderId);

    expect(second).toMatchObject({ reused: true, checkoutUrl: first.checkoutUrl });
    expect(second.payment.id).toBe(first.payment.id);
    expect((await payments.paymentsOf(customer, orderId)).payments).toHaveLength(1);
  });

  it('charges only the balance once part is paid', async () => {
    const { orderId } = await paidOrder(1);
    await createOrdersService({ db: t.db, clock: t.clock, config: t.config }).addRoll(manager, orderId, {
      stockId,
      ei: 200,
      pushPull: 0,
      format: '135-36',
      scannerId: null,
    } as never);

    const balance = await payments.checkout(customer, orderId);

    expect(balance.payment.amount_minor).toBe(rollMinor);
    const session = fake.sessions.get(sessionOf(balance.checkoutUrl))!;
    expect(session.line_items_summary.map((l) => l.name)).toEqual([`Balance of order ${orderId}`]);
  });

  it('refuses an order that is paid, and opens nothing', async () => {
    const { orderId } = await paidOrder(1);
    const sessionsBefore = fake.sessions.size;

    await expect(payments.checkout(customer, orderId)).rejects.toMatchObject({
      status: 409,
      code: 'order-paid',
      message: `Order ${orderId} is already paid.`,
    });
    expect(fake.sessions.size).toBe(sessionsBefore);
    expect((await payments.paymentsOf(customer, orderId)).payments).toHaveLength(1);
  });

  it('refuses an order without rolls', async () => {
    const orderId = await orderOfRolls(0);
    await expect(payments.checkout(customer, orderId)).rejects.toMatchObject({
      status: 409,
      code: 'order-empty',
      message: 'Add a roll to the order before paying.',
    });
  });

  it("answers another customer's order as one that does not exist", async () => {
    const orderId = await orderOfRolls(1);
    await expect(payments.checkout(stranger, orderId)).rejects.toMatchObject({
      status: 404,
      code: 'order-not-found',
      message: `No order with id ${orderId}.`,
    });
    await expect(payments.paymentsOf(stranger, orderId)).rejects.toMatchObject({ status: 404 });
  });
});

describe('a payment event', () => {
  it('marks the payment paid and settles the balance, and changes nothing when it comes again', async () => {
    const orderId = await orderOfRolls(1);
    const { checkoutUrl } = await payments.checkout(customer, orderId);
    expect(await pay(checkoutUrl)).toBe('paid');

    expect(await payments.applyEvent(completed(sessionOf(checkoutUrl)))).toBe('replay');

    const after = await payments.paymentsOf(customer, orderId);
    expect(after.payments.map((p) => p.status)).toEqual(['paid']);
    expect(after.balance).toEqual({
      currency: 'EUR',
      priceMinor: rollMinor,
      paidMinor: rollMinor,
      dueMinor: 0,
    });
  });
});

describe('refunds', () => {
  it('refund part of a payment at the provider and on the record', async () => {
    const { orderId, paymentId, sessionId } = await paidOrder(1);

    const refunded = await payments.refund(manager, paymentId, 500);

    expect(refunded).toMatchObject({ refunded_minor: 500, status: 'partly-refunded' });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(500);
    const listed = await payments.paymentsOf(manager, orderId);
    expect(listed.payments).toMatchObject([{ refundedMinor: 500, status: 'partly-refunded' }]);
  });

  it('refund all that is left when no amount is given', async () => {
    const { paymentId, sessionId } = await paidOrder(1);
    await payments.refund(manager, paymentId, 500);

    const refunded = await payments.refund(manager, paymentId, undefined);

    expect(refunded).toMatchObject({ refunded_minor: rollMinor, status: 'refunded' });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(rollMinor);
  });

  it('beyond what is left are refused with 409, and nothing is refunded', async () => {
    const { paymentId, sessionId } = await paidOrder(1);
    await payments.refund(manager, paymentId, 500);

    await expect(payments.refund(manager, paymentId, 1501)).rejects.toMatchObject({
      status: 409,
      code: 'refund-too-large',
      message: 'At most €15.00 is left to refund.',
    });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(500);
    const row = await t.db
      .selectFrom('payments')
      .select('refunded_minor')
      .where('id', '=', paymentId)
      .executeTakeFirstOrThrow();
    expect(row.refunded_minor).toBe(500);
  });

  it('of a payment not paid yet are refused with 409', async () => {
    const orderId = await orderOfRolls(1);
    const { payment } = await payments.checkout(customer, orderId);
    await expect(payments.refund(manager, payment.id, 100)).rejects.toMatchObject({
      status: 409,
      code: 'not-refundable',
      message: `Payment ${payment.id} is open; only paid payments can be refunded.`,
    });
  });

  it('of a payment that does not exist answer 404', async () => {
    await expect(payments.refund(manager, 99_999, 100)).rejects.toMatchObject({
      status: 404,
      code: 'payment-not-found',
      message: 'No payment with id 99999.',
    });
  });
});
