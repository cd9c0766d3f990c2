import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listCaughtMail, readCaughtMail } from '../dev-mailbox/caught-mail-store';
import { startMailCatcher, type MailCatcher } from '../dev-mailbox/mail-catcher';
import { smtpTransport } from '../mail/mail-transport';
import { createOutboxSender, type OutboxSender } from '../mail/outbox-sender';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { addRenderedFrame } from '../test-support/rendered-frame';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

const logger = pino({ level: 'silent' });
const folder = mkdtempSync(join(tmpdir(), 'clearbase-ready-mail-'));
let t: TestApp;
let catcher: MailCatcher;
let sender: OutboxSender;
let customer: Client;
let operator: Client;
let operatorId: number;
let stockId: number;

beforeAll(async () => {
  t = await createTestApp({ PUBLIC_URL: 'http://scans.lab.test' });
  await t.db
    .insertInto('settings')
    .values({
      key: 'lab',
      value: JSON.stringify({
        name: 'Heronsgate Film Lab',
        town: 'Marlow Fen',
        address: '9 Sluice Row, Marlow Fen',
      }),
    })
    .execute();
  catcher = await startMailCatcher({ folder, logger });
  sender = createOutboxSender({
    db: t.db,
    clock: t.clock,
    logger,
    transport: smtpTransport({
      host: '127.0.0.1',
      port: catcher.port,
      secure: false,
      from: 'desk@heronsgate.test',
    }),
    fromAddress: 'desk@heronsgate.test',
    messageIdHost: 'heronsgate.test',
  });
  await addUser(t.db, 'customer', 'maud@example.test');
  operatorId = await addUser(t.db, 'operator', 'op@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  customer = await signedIn(t.app, 'maud@example.test');
  operator = await signedIn(t.app, 'op@lab.test');
});
afterAll(async () => {
  await sender.stop();
  await catcher.stop();
  await t.close();
  rmSync(folder, { recursive: true, force: true });
});

async function caughtWithSubject(subject: string) {
  await sender.runOnce();
  for (const summary of await listCaughtMail(folder)) {
    const mail = await readCaughtMail(folder, summary.id);
    if (mail?.subject === subject) return mail;
  }
  throw new Error(`no caught mail with subject ${subject}`);
}

/** A payment of the order's whole price the provider confirmed (starter price list: 20.00 a 135-36 C-41 roll). */
async function paidInFull(orderId: number, amountMinor = 2000): Promise<void> {
  const iso = t.clock.now().toISOString();
  await t.db
    .insertInto('payments')
    .values({
      order_id: orderId,
      checkout_session_id: `cs_test_ready_${orderId}_${amountMinor}`,
      amount_minor: amountMinor,
      currency: 'EUR',
      status: 'paid',
      payment_intent_id: `pi_ready_${orderId}`,
      created_at: iso,
      updated_at: iso,
      paid_at: iso,
    })
    .execute();
}

async function addFrame(
  rollId: number,
  index: number,
  decision: 'approved' | 'rejected' | null,
): Promise<number> {
  return addRenderedFrame(t, {
    rollId,
    index,
    fileName: `neg-${index}.tif`,
    outputs: ['jpeg'],
    decision,
    note: decision === 'rejected' ? 'soft' : '',
    reviewerId: operatorId,
  });
}

describe('a placed order', () => {
  it('mails its customer that the lab has it, with a link to the order', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    const mail = await caughtWithSubject(`We have your order: order ${order.body.id}`);
    expect(mail.to).toEqual(['maud@example.test']);
    expect(mail.text).toContain('Heronsgate Film Lab has received order');
    expect(mail.text).toContain(`http://scans.lab.test/orders/${order.body.id}`);
    expect(mail.text).toContain('9 Sluice Row, Marlow Fen');
    expect(mail.html).toContain(`href="http://scans.lab.test/orders/${order.body.id}"`);
  });
});

describe('marking an order ready', () => {
  it('says which rolls are not approved yet and changes nothing', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    const first = await customer
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 200, format: '135-36' })
      .expect(201);
    await customer
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 400, format: '135-36' })
      .expect(201);
    await addFrame(first.body.id as number, 1, 'approved');
    await addFrame(first.body.id as number, 2, 'rejected');

    const res = await operator.post(`/api/orders/${order.body.id}/ready`).expect(409);

    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.detail).toBe(
      `Order ${order.body.id} is not ready: roll 1 has 1 frame not approved; roll 2 has no scans yet.`,
    );
    expect((await customer.get(`/api/orders/${order.body.id}`)).body.order.status).toBe('received');

    const readiness = await operator.get(`/api/orders/${order.body.id}/readiness`).expect(200);
    expect(readiness.body).toEqual({
      ready: false,
      blocker: null,
      waiting: [
        { rollId: first.body.id, rollNumber: 1, reason: 'has 1 frame not approved' },
        { rollId: expect.any(Number), rollNumber: 2, reason: 'has no scans yet' },
      ],
      linkValidHours: 168,
    });
  });

  it('tells staff an order without rolls cannot be marked ready, and keeps the readiness from customers', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    const readiness = await operator.get(`/api/orders/${order.body.id}/readiness`).expect(200);
    expect(readiness.body).toMatchObject({
      ready: false,
      blocker: `Order ${order.body.id} has no rolls to deliver.`,
      waiting: [],
    });
    await customer.get(`/api/orders/${order.body.id}/readiness`).expect(403);
  });

  it('is for staff only', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    await customer.post(`/api/orders/${order.body.id}/ready`).expect(403);
  });

  it('waits for an unpaid order to be paid, unless the lab takes payment on collection', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    const roll = await customer
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 200, format: '135-36' })
      .expect(201);
    await addFrame(roll.body.id as number, 1, 'approved');
    const unpaid = await operator.post(`/api/orders/${order.body.id}/ready`).expect(409);
    expect(unpaid.body).toMatchObject({
      code: 'order-not-paid',
      detail: `Order ${order.body.id} has €20.00 left to pay; it can be marked ready once that is paid.`,
    });
    const lab = { name: 'Heronsgate Film Lab', town: 'Marlow Fen', address: '9 Sluice Row, Marlow Fen' };
    const setLab = (payOnCollection: boolean) =>
      t.db
        .updateTable('settings')
        .set({ value: JSON.stringify({ ...lab, payOnCollection }) })
        .where('key', '=', 'lab')
        .execute();
    await setLab(true);
    try {
      expect((await operator.get(`/api/orders/${order.body.id}/readiness`)).body.ready).toBe(true);
      await operator.post(`/api/orders/${order.body.id}/ready`).expect(200);
      const mail = await caughtWithSubject(`Your scans are ready: order ${order.body.id}`);
      const link = /http:\/\/scans\.lab\.test(\/api\/downloads\/[\w-]+)/.exec(mail.text)?.[1];
      expect((await customer.get(link!)).headers['content-type']).toBe('application/zip');
    } finally {
      await setLab(false);
    }
  });

  it('sets the order ready and mails the customer a working download link and the gallery', async () => {
    const order = await customer.post('/api/orders', {}).expect(201);
    const roll = await customer
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 200, format: '135-36' })
      .expect(201);
    await addFrame(roll.body.id as number, 1, 'approved');
    await paidInFull(order.body.id as number);
    expect((await operator.get(`/api/orders/${order.body.id}/readiness`)).body.ready).toBe(true);

    const res = await operator.post(`/api/orders/${order.body.id}/ready`).expect(200);

    expect(res.body.status).toBe('ready');
    const mail = await caughtWithSubject(`Your scans are ready: order ${order.body.id}`);
    expect(mail.to).toEqual(['maud@example.test']);
    expect(mail.text).toContain(`http://scans.lab.test/orders/${order.body.id}/gallery`);
    expect(mail.text).toContain('7 days');
    const link = /http:\/\/scans\.lab\.test(\/api\/downloads\/[\w-]+)/.exec(mail.text)?.[1];
    expect(link).toBeDefined();
    const zip = await customer.get(link!).expect(200);
    expect(zip.headers['content-type']).toBe('application/zip');
  });
});
