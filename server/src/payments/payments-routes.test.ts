import { pino } from 'pino';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startPaymentFake, type RunningPaymentFake } from '../payment-fake/start-payment-fake';
import { addUser, client, createTestApp, signedIn, type TestApp } from '../test-support/test-app';

let t: TestApp;
let fake: RunningPaymentFake;
let customerId: number;
const webhookSecret = 'whsec_payments_suite';
const secretKey = 'sk_test_payments_suite';
const signer = new Stripe('sk_test_signer');

let stocksMade = 0;

/** An order of the given rolls on a fresh stock and draft profile, written straight to the tables. */
async function addOrder(
  owner: number,
  rolls: { format: string; pushPull: number }[],
  negatives: object = { method: 'collect' },
): Promise<number> {
  stocksMade += 1;
  const now = '2026-03-02T09:00:00.000Z';
  const stock = await t.db
    .insertInto('stocks')
    .values({
      name: `Tidewater 200 batch ${stocksMade}`,
      maker: 'Brackish Emulsions',
      iso: 200,
      process: 'C-41',
      masked: 0,
      base_material: 'polyester',
      frame_formats: JSON.stringify(['135-36']),
      created_at: now,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const profile = await t.db
    .insertInto('profiles')
    .values({
      stock_id: stock.id,
      scanner_id: null,
      name: 'p',
      document_id: `doc-${stock.id}`,
      created_at: now,
      created_by: null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const version = await t.db
    .insertInto('profile_versions')
    .values({
      profile_id: profile.id,
      version: 1,
      status: 'draft',
      parent_version_id: null,
      parameters: '{}',
      changelog: null,
      created_at: now,
      created_by: null,
      updated_at: now,
      published_at: null,
      published_by: null,
      retired_at: null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const order = await t.db
    .insertInto('orders')
    .values({
      customer_id: owner,
      status: 'received',
      output_formats: '["jpeg"]',
      scan_size: 'standard',
      negatives: JSON.stringify(negatives),
      created_at: now,
      updated_at: now,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  for (const roll of rolls) {
    await t.db
      .insertInto('rolls')
      .values({
        order_id: order.id,
        stock_id: stock.id,
        ei: 200,
        push_pull: roll.pushPull,
        format: roll.format,
        scanner_id: null,
        profile_version_id: version.id,
        base_frame_id: null,
        base_region: null,
        base_measured: null,
        adjustments: '{}',
        status: 'awaiting-scans',
        created_at: now,
        updated_at: now,
      })
      .execute();
  }
  return order.id;
}

beforeAll(async () => {
  // the fake's own event posts go nowhere; the tests post the events themselves, signed or not
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
  customerId = await addUser(t.db, 'customer', 'payer@example.test');
  await addUser(t.db, 'customer', 'other@example.test');
  await addUser(t.db, 'manager');
});
afterAll(async () => {
  await t.close();
  await fake.stop();
});

function signed(event: object, secret = webhookSecret) {
  const payload = JSON.stringify(event);
  return { payload, signature: signer.webhooks.generateTestHeaderString({ payload, secret }) };
}

async function postEvent(payload: string, signature: string) {
  const c = await client(t.app);
  return c.agent
    .post('/api/payments/webhook')
    .set('content-type', 'application/json')
    .set('stripe-signature', signature)
    .send(payload);
}

async function approvedEvent(sessionId: string) {
  const approve = await fetch(`${fake.url}/checkout/${sessionId}/approve`, {
    method: 'POST',
    redirect: 'manual',
  });
  expect(approve.status).toBe(303);
  const session = fake.sessions.get(sessionId)!;
  return {
    id: `evt_${sessionId}`,
    object: 'event',
    type: 'checkout.session.completed',
    data: { object: session },
  };
}

describe('paying for an order', () => {
  it('charges posting the negatives back as a line of the whole order when the customer asked for it', async () => {
    const orderId = await addOrder(customerId, [{ format: '135-36', pushPull: 0 }], {
      method: 'post',
      address: { name: 'Ida Payer', line1: '4 Quay Row', town: 'Portwick', country: 'Invented Isles' },
    });
    const payer = await signedIn(t.app, 'payer@example.test');
    const res = await payer.post(`/api/orders/${orderId}/checkout`);
    expect(res.status).toBe(201);
    // starter list: 12.00 develop + 8.00 scan, 4.50 to post the negatives back
    expect(res.body.payment).toMatchObject({ amountMinor: 2000 + 450 });
    const sessionId = new URL(res.body.checkoutUrl).pathname.split('/').at(-1)!;
    expect(fake.sessions.get(sessionId)?.amount_total).toBe(2450);
  });

  it('opens a checkout priced from the price list and marks it paid only on the signed event, once', async () => {
    const orderId = await addOrder(customerId, [
      { format: '135-36', pushPull: 0 },
      { format: '135-36', pushPull: 1 },
    ]);
    const payer = await signedIn(t.app, 'payer@example.test');
    const res = await payer.post(`/api/orders/${orderId}/checkout`);
    expect(res.status).toBe(201);
    // starter list: 12.00 develop + 8.00 scan per roll, 3.00 a stop
    expect(res.body.payment).toMatchObject({ amountMinor: 2 * 2000 + 300, currency: 'EUR', status: 'open' });
    const sessionId = new URL(res.body.checkoutUrl).pathname.split('/').at(-1)!;
    expect(fake.sessions.get(sessionId)?.amount_total).toBe(4300);

    const event = await approvedEvent(sessionId);
    const { payload, signature } = signed(event);
    const first = await postEvent(payload, signature);
    expect(first.status).toBe(200);
    expect(first.body.outcome).toBe('paid');
    const replay = await postEvent(payload, signature);
    expect(replay.status).toBe(200);
    expect(replay.body.outcome).toBe('replay');

    const list = await payer.get(`/api/orders/${orderId}/payments`);
    expect(list.body.payments).toHaveLength(1);
    expect(list.body.payments[0]).toMatchObject({ status: 'paid', amountMinor: 4300 });
    const receipts = await t.db
      .selectFrom('outbox')
      .selectAll()
      .where('kind', '=', 'payment-receipt')
      .execute();
    expect(receipts).toHaveLength(1);
    expect(receipts[0]!.text_body).toContain('€43.00');
    const events = await t.db
      .selectFrom('payment_events')
      .selectAll()
      .where('event_id', '=', event.id)
      .execute();
    expect(events).toHaveLength(1);

    expect((await payer.post(`/api/orders/${orderId}/checkout`)).status).toBe(409);
  });

  it('refuses an event with a wrong signature with 400 and changes nothing', async () => {
    const orderId = await addOrder(customerId, [{ format: '135-36', pushPull: 0 }]);
    const payer = await signedIn(t.app, 'payer@example.test');
    const res = await payer.post(`/api/orders/${orderId}/checkout`);
    const sessionId = new URL(res.body.checkoutUrl).pathname.split('/').at(-1)!;
    const event = await approvedEvent(sessionId);

    const forged = signed(event, 'whsec_someone_else');
    const refused = await postEvent(forged.payload, forged.signature);
    expect(refused.status).toBe(400);
    expect(refused.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(refused.body.code).toBe('bad-signature');

    const tampered = signed(event);
    const altered = tampered.payload.replace('"amount_total":2000', '"amount_total":1');
    expect(altered).not.toBe(tampered.payload);
    expect((await postEvent(altered, tampered.signature)).status).toBe(400);

    const unsigned = await postEvent(JSON.stringify(event), '');
    expect(unsigned.status).toBe(400);

    const payment = await t.db
      .selectFrom('payments')
      .selectAll()
      .where('order_id', '=', orderId)
      .executeTakeFirstOrThrow();
    expect(payment.status).toBe('open');
    expect(
      await t.db.selectFrom('payment_events').selectAll().where('event_id', '=', event.id).execute(),
    ).toEqual([]);
  });

  it('marks a declined checkout declined', async () => {
    const orderId = await addOrder(customerId, [{ format: '135-36', pushPull: 0 }]);
    const payer = await signedIn(t.app, 'payer@example.test');
    const res = await payer.post(`/api/orders/${orderId}/checkout`);
    const sessionId = new URL(res.body.checkoutUrl).pathname.split('/').at(-1)!;
    await fetch(`${fake.url}/checkout/${sessionId}/decline`, { method: 'POST', redirect: 'manual' });
    const { payload, signature } = signed({
      id: `evt_declined_${sessionId}`,
      object: 'event',
      type: 'checkout.session.expired',
      data: { object: fake.sessions.get(sessionId) },
    });
    expect((await postEvent(payload, signature)).body.outcome).toBe('declined');
  });

  it('lets a manager refund part and then the rest through the provider', async () => {
    const orderId = await addOrder(customerId, [{ format: '135-36', pushPull: 0 }]);
    const payer = await signedIn(t.app, 'payer@example.test');
    const res = await payer.post(`/api/orders/${orderId}/checkout`);
    const sessionId = new URL(res.body.checkoutUrl).pathname.split('/').at(-1)!;
    const { payload, signature } = signed(await approvedEvent(sessionId));
    await postEvent(payload, signature);
    const paymentId = res.body.payment.id as number;

    const manager = await signedIn(t.app, 'manager@lab.test');
    const part = await manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 500 });
    expect(part.status).toBe(200);
    expect(part.body.payment).toMatchObject({ status: 'partly-refunded', refundedMinor: 500 });
    expect((await manager.post(`/api/payments/${paymentId}/refund`, { amountMinor: 5000 })).status).toBe(409);
    const rest = await manager.post(`/api/payments/${paymentId}/refund`, {});
    expect(rest.body.payment).toMatchObject({ status: 'refunded', refundedMinor: 2000 });
    expect(fake.sessions.get(sessionId)?.refunded).toBe(2000);
    const audit = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'payment-refunded')
      .execute();
    expect(audit.map((a) => JSON.parse(a.details!).amountMinor)).toEqual([500, 1500]);
    expect(audit[0]).toMatchObject({ actor_email: 'manager@lab.test', target: `order:${orderId}` });

    expect((await payer.post(`/api/payments/${paymentId}/refund`, {})).status).toBe(403);
  });

  it('answers another customer’s order as one that does not exist', async () => {
    const orderId = await addOrder(customerId, [{ format: '135-36', pushPull: 0 }]);
    const other = await signedIn(t.app, 'other@example.test');
    expect((await other.post(`/api/orders/${orderId}/checkout`)).status).toBe(404);
    expect((await other.get(`/api/orders/${orderId}/payments`)).status).toBe(404);
  });
});
