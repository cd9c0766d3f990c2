import type { ReviewDecision, User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { createOrdersService } from '../orders/orders-service';
import { addRenderedFrame } from '../test-support/rendered-frame';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createMarkReadyService } from './mark-ready-service';

let t: TestApp;
let customer: User;
let operator: User;
let stockId: number;
const ready = () => createMarkReadyService({ db: t.db, clock: t.clock, config: t.config });
const orders = () => createOrdersService({ db: t.db, clock: t.clock, config: t.config });

beforeAll(async () => {
  t = await createTestApp({ PUBLIC_URL: 'http://scans.lab.test' });
  customer = {
    id: await addUser(t.db, 'customer', 'maud@example.test'),
    email: 'maud@example.test',
    name: 'Test customer',
    role: 'customer',
  };
  operator = {
    id: await addUser(t.db, 'operator', 'op@lab.test'),
    email: 'op@lab.test',
    name: 'Test operator',
    role: 'operator',
  };
  ({ stockId } = await addTestCatalogue(t.db));
});
afterAll(() => t.close());

/** An order of the customer's with `rolls` rolls of the test stock; returns its id and its roll ids in order. */
async function orderOfRolls(rolls: number): Promise<{ orderId: number; rollIds: number[] }> {
  const order = await orders().place(customer, {
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
  const rows = await t.db
    .selectFrom('rolls')
    .select('id')
    .where('order_id', '=', order.id)
    .orderBy('id')
    .execute();
  return { orderId: order.id, rollIds: rows.map((r) => r.id) };
}

/** A rendered frame on the roll with the operator's decision, or none yet. */
async function addFrame(rollId: number, index: number, decision: ReviewDecision | null): Promise<void> {
  await addRenderedFrame(t, {
    rollId,
    index,
    fileName: `neg-${index}.tif`,
    outputs: [],
    decision,
    reviewerId: operator.id,
  });
}

/** A payment of `amountMinor` the provider confirmed (starter price list: 20.00 a 135-36 C-41 roll). */
async function paid(orderId: number, amountMinor = 2000): Promise<void> {
  const iso = t.clock.now().toISOString();
  await t.db
    .insertInto('payments')
    .values({
      order_id: orderId,
      checkout_session_id: `cs_test_mark_ready_${orderId}`,
      amount_minor: amountMinor,
      currency: 'EUR',
      status: 'paid',
      payment_intent_id: `pi_mark_ready_${orderId}`,
      created_at: iso,
      updated_at: iso,
      paid_at: iso,
    })
    .execute();
}

/** What marking ready leaves behind for an order: status changes audited, tokens, and mails queued. */
async function traces(orderId: number) {
  const audit = await t.db
    .selectFrom('audit_log')
    .select(['action', 'details'])
    .where('target', '=', `order:${orderId}`)
    .where('action', '=', 'order-status-changed')
    .execute();
  const tokens = await t.db
    .selectFrom('download_tokens')
    .selectAll()
    .where('order_id', '=', orderId)
    .execute();
  const mails = await t.db
    .selectFrom('outbox')
    .select(['to_address', 'text_body'])
    .where('kind', '=', 'scans-ready')
    .where('text_body', 'like', `%/orders/${orderId}/gallery%`)
    .execute();
  const { status } = await t.db
    .selectFrom('orders')
    .select('status')
    .where('id', '=', orderId)
    .executeTakeFirstOrThrow();
  return { status, audit, tokens, mails };
}

describe('the readiness of an order', () => {
  it('lists each roll not approved yet with its reason, in roll order', async () => {
    const { orderId, rollIds } = await orderOfRolls(3);
    await addFrame(rollIds[0]!, 1, 'approved');
    await addFrame(rollIds[0]!, 2, 'rejected');
    await addFrame(rollIds[0]!, 3, null);
    await addFrame(rollIds[1]!, 1, 'excluded');
    await addFrame(rollIds[1]!, 2, 'approved');

    expect(await ready().readiness(operator, orderId)).toEqual({
      ready: false,
      blocker: null,
      waiting: [
        { rollId: rollIds[0], rollNumber: 1, reason: 'has 2 frames not approved' },
        { rollId: rollIds[2], rollNumber: 3, reason: 'has no scans yet' },
      ],
      linkValidHours: t.config.downloadLinkHours,
    });
  });

  it('names what is left to pay once every roll is approved', async () => {
    const { orderId, rollIds } = await orderOfRolls(1);
    await addFrame(rollIds[0]!, 1, 'approved');
    expect(await ready().readiness(operator, orderId)).toMatchObject({
      ready: false,
      blocker: `Order ${orderId} has €20.00 left to pay; it can be marked ready once that is paid.`,
      waiting: [],
    });
  });

  it('says an order without rolls has nothing to deliver', async () => {
    const { orderId } = await orderOfRolls(0);
    expect(await ready().readiness(operator, orderId)).toMatchObject({
      ready: false,
      blocker: `Order ${orderId} has no rolls to deliver.`,
      waiting: [],
    });
  });
});

describe('marking an order ready', () => {
  it('refuses an order with rolls not approved, naming each, and changes nothing', async () => {
    const { orderId, rollIds } = await orderOfRolls(2);
    await addFrame(rollIds[0]!, 1, 'approved');
    await paid(orderId, 4000);
    await expect(ready().markReady(operator, orderId)).rejects.toMatchObject({
      status: 409,
      code: 'order-not-approved',
      message: `Order ${orderId} is not ready: roll 2 has no scans yet.`,
    });
    expect(await traces(orderId)).toEqual({ status: 'received', audit: [], tokens: [], mails: [] });
  });

  it('refuses an unpaid order with what is left to pay, and changes nothing', async () => {
    const { orderId, rollIds } = await orderOfRolls(1);
    await addFrame(rollIds[0]!, 1, 'approved');
    await expect(ready().markReady(operator, orderId)).rejects.toMatchObject({
      status: 409,
      code: 'order-not-paid',
      message: `Order ${orderId} has €20.00 left to pay; it can be marked ready once that is paid.`,
    });
    expect(await traces(orderId)).toEqual({ status: 'received', audit: [], tokens: [], mails: [] });
  });

  it('moves a paid, approved order to ready with its audit line, a download token and the mail, in one go', async () => {
    const { orderId, rollIds } = await orderOfRolls(1);
    await addFrame(rollIds[0]!, 1, 'approved');
    await paid(orderId);

    const order = await ready().markReady(operator, orderId);

    expect(order).toMatchObject({ id: orderId, status: 'ready' });
    const after = await traces(orderId);
    expect(after.status).toBe('ready');
    expect(after.audit).toHaveLength(1);
    expect(JSON.parse(after.audit[0]!.details!)).toMatchObject({
      before: 'received',
      after: 'ready',
      because: 'marked ready',
      mailedTo: 'maud@example.test',
    });
    expect(after.tokens).toMatchObject([{ created_by: operator.id }]);
    const hours = (Date.parse(after.tokens[0]!.expires_at) - t.clock.now().getTime()) / 3_600_000;
    expect(hours).toBe(t.config.downloadLinkHours);
    expect(after.mails).toHaveLength(1);
    expect(after.mails[0]!.to_address).toBe('maud@example.test');
    expect(after.mails[0]!.text_body).toMatch(/http:\/\/scans\.lab\.test\/api\/downloads\/[\w-]+/);
  });

  it('mails the link again to an order already ready, without a second status change', async () => {
    const { orderId, rollIds } = await orderOfRolls(1);
    await addFrame(rollIds[0]!, 1, 'approved');
    await paid(orderId);
    await ready().markReady(operator, orderId);

    const again = await ready().markReady(operator, orderId);

    expect(again.status).toBe('ready');
    const after = await traces(orderId);
    expect(after.audit).toHaveLength(1);
    expect(after.tokens).toHaveLength(2);
    expect(after.mails).toHaveLength(2);
    const links = after.mails.map((m) => /\/api\/downloads\/[\w-]+/.exec(m.text_body)?.[0]);
    expect(new Set(links).size).toBe(2);
  });

  it('answers a customer as if the order did not exist', async () => {
    const { orderId } = await orderOfRolls(1);
    const stranger: User = { ...customer, id: customer.id + 1000 };
    await expect(ready().markReady(stranger, orderId)).rejects.toMatchObject({ status: 404 });
  });
});
