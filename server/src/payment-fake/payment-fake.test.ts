import express from 'express';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pino } from 'pino';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createPaymentClient } from '../payments/payment-client';
import { blockOutboundNetwork } from '../test-support/block-outbound-network';
import { startPaymentFake, type RunningPaymentFake } from './start-payment-fake';
import { signWebhookPayload } from './webhook-signature';

blockOutboundNetwork();

const secretKey = 'sk_test_fake_suite';
const webhookSecret = 'whsec_fake_suite';
let fake: RunningPaymentFake;
let receiver: Server;
const received: { body: string; signature: string }[] = [];
let sdk: Stripe;

beforeAll(async () => {
  const app = express();
  app.post('/hook', express.text({ type: '*/*' }), (req, res) => {
    received.push({ body: req.body as string, signature: req.get('stripe-signature') ?? '' });
    res.json({ received: true });
  });
  receiver = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const hookUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hook`;
  fake = await startPaymentFake({
    secretKey,
    webhookSecret,
    webhookUrl: hookUrl,
    logger: pino({ level: 'silent' }),
  });
  sdk = createPaymentClient({ apiBase: fake.url, secretKey, webhookSecret, fakePort: 0 });
});
afterAll(async () => {
  await fake.stop();
  await new Promise((r) => receiver.close(r));
});

async function newSession() {
  return sdk.checkout.sessions.create({
    mode: 'payment',
    client_reference_id: 'order:12',
    metadata: { orderId: '12' },
    success_url: 'http://127.0.0.1:1/paid?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:1/cancelled',
    line_items: [
      {
        quantity: 2,
        price_data: { currency: 'eur', unit_amount: 1150, product_data: { name: 'Roll, 135-36' } },
      },
    ],
  });
}

describe('the payment fake, driven by the provider’s own SDK', () => {
  it('creates a checkout session and retrieves it', async () => {
    const session = await newSession();
    expect(session.id).toMatch(/^cs_test_/);
    expect(session).toMatchObject({
      status: 'open',
      payment_status: 'unpaid',
      amount_total: 2300,
      currency: 'eur',
    });
    expect(session.client_reference_id).toBe('order:12');
    expect(session.metadata).toEqual({ orderId: '12' });
    expect(session.url).toBe(`${fake.url}/checkout/${session.id}`);
    const again = await sdk.checkout.sessions.retrieve(session.id);
    expect(again.id).toBe(session.id);
  });

  it('refuses a wrong secret key the way the SDK understands', async () => {
    const wrong = createPaymentClient({
      apiBase: fake.url,
      secretKey: 'sk_test_wrong',
      webhookSecret,
      fakePort: 0,
    });
    await expect(wrong.checkout.sessions.retrieve('cs_test_x')).rejects.toMatchObject({
      type: 'StripeAuthenticationError',
      statusCode: 401,
    });
  });

  it('approves on its checkout page, posts an event the SDK verifies, and sends the browser back', async () => {
    const session = await newSession();
    const page = await fetch(session.url!);
    expect(await page.text()).toContain('Pay 23.00 EUR');

    const approve = await fetch(`${fake.url}/checkout/${session.id}/approve`, {
      method: 'POST',
      redirect: 'manual',
    });
    expect(approve.status).toBe(303);
    expect(approve.headers.get('location')).toBe(`http://127.0.0.1:1/paid?session=${session.id}`);

    const delivered = received.at(-1)!;
    const event = sdk.webhooks.constructEvent(delivered.body, delivered.signature, webhookSecret);
    expect(event.type).toBe('checkout.session.completed');
    const paid = event.data.object as Stripe.Checkout.Session;
    expect(paid).toMatchObject({ id: session.id, payment_status: 'paid', status: 'complete' });
    expect(paid.payment_intent).toMatch(/^pi_/);

    const refund = await sdk.refunds.create({ payment_intent: paid.payment_intent as string, amount: 1000 });
    expect(refund).toMatchObject({ amount: 1000, status: 'succeeded' });
    await expect(
      sdk.refunds.create({ payment_intent: paid.payment_intent as string, amount: 5000 }),
    ).rejects.toMatchObject({
      statusCode: 400,
    });
  });

  it('declines: the session expires and the browser goes to the cancel address', async () => {
    const session = await newSession();
    const decline = await fetch(`${fake.url}/checkout/${session.id}/decline`, {
      method: 'POST',
      redirect: 'manual',
    });
    expect(decline.headers.get('location')).toBe('http://127.0.0.1:1/cancelled');
    expect((await sdk.checkout.sessions.retrieve(session.id)).status).toBe('expired');
    const event = sdk.webhooks.constructEvent(
      received.at(-1)!.body,
      received.at(-1)!.signature,
      webhookSecret,
    );
    expect(event.type).toBe('checkout.session.expired');
  });

  it('expires an open session when asked, and refuses to expire one already paid', async () => {
    const open = await newSession();
    const expired = await sdk.checkout.sessions.expire(open.id);
    expect(expired).toMatchObject({ id: open.id, status: 'expired', url: null });
    const paid = await newSession();
    await fetch(`${fake.url}/checkout/${paid.id}/approve`, { method: 'POST', redirect: 'manual' });
    await expect(sdk.checkout.sessions.expire(paid.id)).rejects.toMatchObject({
      type: 'StripeInvalidRequestError',
      statusCode: 400,
    });
  });

  it('answers a refund sent again with the same idempotency key as the first time, refunding once', async () => {
    const session = await newSession();
    await fetch(`${fake.url}/checkout/${session.id}/approve`, { method: 'POST', redirect: 'manual' });
    const intent = fake.sessions.get(session.id)!.payment_intent!;
    const first = await sdk.refunds.create(
      { payment_intent: intent, amount: 700 },
      { idempotencyKey: 'r-1' },
    );
    const again = await sdk.refunds.create(
      { payment_intent: intent, amount: 700 },
      { idempotencyKey: 'r-1' },
    );
    expect(again.id).toBe(first.id);
    expect(fake.sessions.get(session.id)?.refunded).toBe(700);
  });
});

describe('signWebhookPayload', () => {
  it('makes the header the SDK’s own test helper makes for the same payload, secret and time', () => {
    const payload = '{"id":"evt_1","object":"event"}';
    const ours = signWebhookPayload(payload, 'whsec_abc', 1767225600);
    const theirs = new Stripe('sk_test_x').webhooks.generateTestHeaderString({
      payload,
      secret: 'whsec_abc',
      timestamp: 1767225600,
    });
    expect(ours).toBe(theirs);
  });
});
