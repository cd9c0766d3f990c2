import { pino } from 'pino';
import sharp from 'sharp';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { startPaymentFake, type RunningPaymentFake } from '../payment-fake/start-payment-fake';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  type Client,
  type TestApp,
} from '../test-support/test-app';

let t: TestApp;
let fake: RunningPaymentFake;
let payer: Client;
let operator: Client;
let manager: Client;
let operatorId: number;
let stockId: number;
const webhookSecret = 'whsec_settle_suite';
const secretKey = 'sk_test_settle_suite';
const signer = new Stripe('sk_test_signer');
// starter price list: 12.00 develop + 8.00 scan for a 135-36 C-41 roll at standard size
const rollMinor = 2000;

beforeAll(async () => {
  // the fake's own event posts go nowhere; the tests post the events themselves
  fake = await startPaymentFake({
    secretKey,
    webhookSecret,
    webhookUrl: 'http://127.0.0.1:1/unused',
    logger: pino({ level: 'silent' }),
  });
  t = await createTestApp({
    LOCAL_FAKES: 'true',
    PAYMENT_API_BASE: fake.url,
    PAYMENT_SECRET_KEY: secretKey,
    PAYMENT_WEBHOOK_SECRET: webhookSecret,
  });
  await addUser(t.db, 'customer', 'payer@example.test');
  operatorId = await addUser(t.db, 'operator', 'op@lab.test');
  await addUser(t.db, 'manager', 'boss@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  payer = await signedIn(t.app, 'payer@example.test');
  operator = await signedIn(t.app, 'op@lab.test');
  manager = await signedIn(t.app, 'boss@lab.test');
});
afterAll(async () => {
  await t.close();
  await fake.stop();
});

async function orderOfRolls(rolls: number): Promise<number> {
  const order = await payer.post('/api/orders', { outputFormats: ['jpeg'] }).expect(201);
  for (let i = 0; i < rolls; i++) {
    await payer
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 200, format: '135-36' })
      .expect(201);
  }
  return order.body.id as number;
}

const sessionOf = (checkoutUrl: string) => new URL(checkoutUrl).pathname.split('/').at(-1)!;

/** The customer approves the checkout on the provider's page; its signed event reaches the app. */
async function pay(sessionId: string): Promise<string> {
  const approve = await fetch(`${fake.url}/checkout/${sessionId}/approve`, {
    method: 'POST',
    redirect: 'manual',
  });
  expect(approve.status).toBe(303);
  const payload = JSON.stringify({
    id: `evt_paid_${sessionId}`,
    object: 'event',
    type: 'checkout.session.completed',
    data: { object: fake.sessions.get(sessionId) },
  });
  const c = await client(t.app);
  const res = await c.agent
    .post('/api/payments/webhook')
    .set('content-type', 'application/json')
    .set('stripe-signature', signer.webhooks.generateTestHeaderString({ payload, secret: webhookSecret }))
    .send(payload);
  expect(res.status).toBe(200);
  return res.body.outcome as string;
}

async function paidOrder(rolls: number): Promise<{ orderId: number; paymentId: number; sessionId: string }> {
  const orderId = await orderOfRolls(rolls);
  const res = await payer.post(`/api/orders/${orderId}/checkout`).expect(201);
  const sessionId = sessionOf(res.body.checkoutUrl as string);
  expect(await pay(sessionId)).toBe('paid');
  return { orderId, paymentId: res.body.payment.id as number, sessionId };
}

/** An approved rendered frame on each roll of the order, so only payment can keep it from being marked ready. */
async function approveEveryRoll(orderId: number): Promise<void> {
  const rolls = await t.db.selectFrom('rolls').select('id').where('order_id', '=', orderId).execute();
  const store = createFileStore(t.config.dataDir);
  const stored = await store.putBytes(
    await sharp({ create: { width: 8, height: 8, channels: 3, background: '#808080' } })
      .jpeg()
      .toBuffer(),
  );
  const at = t.clock.now();
  const file = await recordFile(t.db, {
    sha256: stored.sha256,
    size: stored.size,
    mediaType: 'image/jpeg',
    at,
  });
  for (const roll of rolls) {
    const frame = await t.db
      .insertInto('frames')
      .values({
        roll_id: roll.id,
        frame_index: 1,
        source_file_id: file.id,
        file_name: 'neg-1.tif',
        width: 8,
        height: 8,
        bit_depth: 16,
        base_region: null,
        base_source: null,
        base_measured: null,
        adjustments: '{}',
        status: 'done',
        error: null,
        rendered_at: at.toISOString(),
        created_at: at.toISOString(),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await t.db
      .insertInto('frame_reviews')
      .values({
        frame_id: frame.id,
        decision: 'approved',
        note: '',
        reviewed_by: operatorId,
        reviewed_at: at.toISOString(),
      })
      .execute();
  }
}

describe('checking out twice', () => {
  it('reuses the open checkout, so two tabs pay one session', async () => {
    const orderId = await orderOfRolls(1);
    const [first, second] = await Promise.all([
      payer.post(`/api/orders/${orderId}/checkout`),
      payer.post(`/api/orders/${orderId}/checkout`),
    ]);
    expect([first.status, second.status].sort()).toEqual([200, 201]);
    expect(second.body.checkoutUrl).toBe(first.body.checkoutUrl);
    expect(second.body.payment.id).toBe(first.body.payment.id);
    const list = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(list.body.payments).toHaveLength(1);
  });

  it('expires the earlier checkout at the provider when the order changed, and opens one for the new amount', async () => {
    const orderId = await orderOfRolls(1);
    const first = await payer.post(`/api/orders/${orderId}/checkout`).expect(201);
    await payer.post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201);
    const second = await payer.post(`/api/orders/${orderId}/checkout`).expect(201);
    expect(second.body.payment.amountMinor).toBe(2 * rollMinor);
    expect(fake.sessions.get(sessionOf(first.body.checkoutUrl as string))?.status).toBe('expired');
    const list = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(list.body.payments.map((p: { status: string }) => p.status)).toEqual(['declined', 'open']);
  });

  it('refunds a second payment for an order already paid, in full and on the record', async () => {
    const { orderId, sessionId } = await paidOrder(1);
    // a checkout opened elsewhere for the same order (another tab before the first was paid), then paid too
    const stray = await new Stripe(secretKey, {
      host: '127.0.0.1',
      port: Number(new URL(fake.url).port),
      protocol: 'http',
    }).checkout.sessions.create({
      mode: 'payment',
      success_url: 'http://scans.lab.test/done',
      line_items: [
        {
          quantity: 1,
          price_data: { currency: 'eur', unit_amount: rollMinor, product_data: { name: 'Roll' } },
        },
      ],
    });
    const iso = t.clock.now().toISOString();
    const strayRow = await t.db
      .insertInto('payments')
      .values({
        order_id: orderId,
        checkout_session_id: stray.id,
        amount_minor: rollMinor,
        currency: 'EUR',
        status: 'open',
        payment_intent_id: null,
        created_at: iso,
        updated_at: iso,
        paid_at: null,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    expect(await pay(stray.id)).toBe('paid-surplus-refunded');
    expect(fake.sessions.get(stray.id)?.refunded).toBe(rollMinor);
    expect(fake.sessions.get(sessionId)?.refunded).toBe(0);
    const list = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(
      list.body.payments.map((p: { status: string; refundedMinor: number }) => [p.status, p.refundedMinor]),
    ).toEqual([
      ['paid', 0],
      ['refunded', rollMinor],
    ]);
    expect(list.body.balance).toEqual({
      currency: 'EUR',
      priceMinor: rollMinor,
      paidMinor: rollMinor,
      dueMinor: 0,
    });
    const refunds = await t.db
      .selectFrom('payment_refunds')
      .selectAll()
      .where('payment_id', '=', strayRow.id)
      .execute();
    expect(refunds).toMatchObject([{ amount_minor: rollMinor, reason: 'surplus', status: 'succeeded' }]);
    const audit = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'payment-refunded')
      .execute();
    expect(audit.some((a) => JSON.parse(a.details!).paymentId === strayRow.id)).toBe(true);
  });
});

describe('a checkout the app had given up on', () => {
  it('is still recorded when its payment comes in, and refunded when the order did not need it', async () => {
    const orderId = await orderOfRolls(1);
    const first = await payer.post(`/api/orders/${orderId}/checkout`).expect(201);
    const firstSession = sessionOf(first.body.checkoutUrl as string);
    // marked declined here while the customer was still paying it at the provider
    await t.db
      .updateTable('payments')
      .set({ status: 'declined' })
      .where('id', '=', first.body.payment.id)
      .execute();
    const second = await payer.post(`/api/orders/${orderId}/checkout`);
    expect(await pay(sessionOf(second.body.checkoutUrl as string))).toBe('paid');
    expect(await pay(firstSession)).toBe('paid-surplus-refunded');
    const list = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(list.body.payments.map((p: { status: string }) => p.status)).toEqual(['refunded', 'paid']);
    expect(list.body.balance).toMatchObject({ paidMinor: rollMinor, dueMinor: 0 });
  });
});

describe('rolls added after paying', () => {
  it('leave a balance that checkout charges exactly, and marking ready waits for it', async () => {
    const { orderId } = await paidOrder(1);
    for (let i = 0; i < 5; i++) {
      await operator.post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201);
    }
    const list = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(list.body.balance).toEqual({
      currency: 'EUR',
      priceMinor: 6 * rollMinor,
      paidMinor: rollMinor,
      dueMinor: 5 * rollMinor,
    });
    await approveEveryRoll(orderId);
    const waiting = await operator.post(`/api/orders/${orderId}/ready`);
    expect(waiting.status).toBe(409);
    expect(waiting.body).toMatchObject({
      code: 'order-not-paid',
      detail: `Order ${orderId} has €100.00 left to pay; it can be marked ready once that is paid.`,
    });
    const readiness = await operator.get(`/api/orders/${orderId}/readiness`).expect(200);
    expect(readiness.body).toMatchObject({ ready: false, blocker: waiting.body.detail });

    const balance = await payer.post(`/api/orders/${orderId}/checkout`).expect(201);
    expect(balance.body.payment.amountMinor).toBe(5 * rollMinor);
    const session = fake.sessions.get(sessionOf(balance.body.checkoutUrl as string))!;
    expect(session.amount_total).toBe(5 * rollMinor);
    expect(session.line_items_summary.map((l) => l.name)).toEqual([`Balance of order ${orderId}`]);
    expect(await pay(session.id)).toBe('paid');
    const settled = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
    expect(settled.body.balance.dueMinor).toBe(0);
    const paidUp = await payer.post(`/api/orders/${orderId}/checkout`);
    expect(paidUp.status).toBe(409);
    expect(paidUp.body.code).toBe('order-paid');
    await operator.post(`/api/orders/${orderId}/ready`).expect(200);
  });
});

describe('prices changed after an order was placed', () => {
  it('change nothing it owes: its rolls, old and new, are charged at the prices it was placed under', async () => {
    const { orderId } = await paidOrder(1);
    const list = (await manager.get('/api/prices').expect(200)).body;
    const dearer = {
      ...list,
      scan: list.scan.map((s: { size: string; amountMinor: number }) => ({
        ...s,
        amountMinor: s.amountMinor * 3,
      })),
    };
    await manager.send('put', '/api/prices', dearer).expect(200);
    try {
      const paid = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
      expect(paid.body.balance).toMatchObject({ priceMinor: rollMinor, dueMinor: 0 });
      await operator.post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201);
      const more = await payer.get(`/api/orders/${orderId}/payments`).expect(200);
      expect(more.body.balance).toMatchObject({ priceMinor: 2 * rollMinor, dueMinor: rollMinor });
    } finally {
      await manager.send('put', '/api/prices', list).expect(200);
    }
  });
});

describe('refunds', () => {
  it('asked for at the same time add up on the record exactly as the provider refunded them', async () => {
    const { paymentId, sessionId } = await paidOrder(1);
    const three = await Promise.all(
      [1, 2, 3].map(() => manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 500 })),
    );
    expect(three.map((r) => r.status)).toEqual([200, 200, 200]);
    const afterThree = await manager.get(`/api/orders/${three[0]!.body.payment.orderId}/payments`);
    expect(afterThree.body.payments[0]).toMatchObject({ refundedMinor: 1500, status: 'partly-refunded' });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(1500);

    const more = await Promise.all(
      [1, 2, 3].map(() => manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 300 })),
    );
    expect(more.map((r) => r.status).sort()).toEqual([200, 409, 409]);
    const refused = more.find((r) => r.status === 409)!;
    expect(refused.headers['content-type']).toContain('application/problem+json');
    expect(refused.body).toMatchObject({
      code: 'refund-too-large',
      detail: 'At most €2.00 is left to refund.',
    });
    const payment = await t.db
      .selectFrom('payments')
      .selectAll()
      .where('id', '=', paymentId)
      .executeTakeFirstOrThrow();
    expect(payment.refunded_minor).toBe(1800);
    expect(fake.sessions.get(sessionId)?.refunded).toBe(1800);
  });

  it('that the provider refuses answer 502 with its reason, and change nothing', async () => {
    const { paymentId, sessionId } = await paidOrder(1);
    // refunded at the provider behind the lab's back: the provider has nothing left to refund
    fake.sessions.get(sessionId)!.refunded = rollMinor;
    const res = await manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 500 });
    expect(res.status).toBe(502);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body).toMatchObject({
      code: 'refund-refused',
      detail: 'The payment provider refused the refund: Refund amount must be between 1 and 0.',
    });
    const payment = await t.db
      .selectFrom('payments')
      .selectAll()
      .where('id', '=', paymentId)
      .executeTakeFirstOrThrow();
    expect([payment.status, payment.refunded_minor]).toEqual(['paid', 0]);
    const refunds = await t.db
      .selectFrom('payment_refunds')
      .selectAll()
      .where('payment_id', '=', paymentId)
      .execute();
    expect(refunds).toMatchObject([{ status: 'failed', failure: 'Refund amount must be between 1 and 0.' }]);
  });

  it('left without an answer are asked again with the same key before the next, so none is refunded twice', async () => {
    const { paymentId, sessionId } = await paidOrder(1);
    const intent = fake.sessions.get(sessionId)!.payment_intent!;
    // the server stopped after the provider refunded 4.00 and before the answer was recorded
    const iso = t.clock.now().toISOString();
    const held = await t.db
      .insertInto('payment_refunds')
      .values({
        payment_id: paymentId,
        amount_minor: 400,
        reason: 'requested',
        status: 'pending',
        provider_refund_id: null,
        failure: null,
        requested_by: null,
        created_at: iso,
        updated_at: iso,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const sdk = new Stripe(secretKey, {
      host: '127.0.0.1',
      port: Number(new URL(fake.url).port),
      protocol: 'http',
    });
    await sdk.refunds.create(
      { payment_intent: intent, amount: 400 },
      { idempotencyKey: `refund-${intent}-${held.id}` },
    );
    // what is held counts against what is left
    expect((await manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 1700 })).status).toBe(409);
    const res = await manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 500 }).expect(200);
    expect(res.body.payment).toMatchObject({ refundedMinor: 900, status: 'partly-refunded' });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(900);
    const refunds = await t.db
      .selectFrom('payment_refunds')
      .selectAll()
      .where('payment_id', '=', paymentId)
      .execute();
    expect(refunds.map((r) => [r.amount_minor, r.status])).toEqual([
      [400, 'succeeded'],
      [500, 'succeeded'],
    ]);
  });
});
