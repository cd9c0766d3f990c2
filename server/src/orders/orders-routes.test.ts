import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { addTestCatalogue } from './order-test-fixtures';

let t: TestApp;
let catalogue: Awaited<ReturnType<typeof addTestCatalogue>>;
let customer: Client;
let other: Client;
let operator: Client;
let customerId: number;

beforeAll(async () => {
  t = await createTestApp();
  customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'customer', 'ines@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  catalogue = await addTestCatalogue(t.db);
  customer = await signedIn(t.app, 'cass@lab.test');
  other = await signedIn(t.app, 'ines@lab.test');
  operator = await signedIn(t.app, 'oskar@lab.test');
});
afterAll(() => t.close());

describe('orders', () => {
  it('lets a customer place an order for themselves, received, with the formats and size asked for', async () => {
    const res = await customer.post('/api/orders', { outputFormats: ['jpeg', 'tiff16'], scanSize: 'large' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      customerId,
      customerName: 'Test customer',
      status: 'received',
      outputFormats: ['jpeg', 'tiff16'],
      scanSize: 'large',
      rollCount: 0,
    });
  });

  it('shows a customer only their own orders, and staff every order', async () => {
    await other.post('/api/orders', {}).expect(201);
    const mine = await customer.get('/api/orders').expect(200);
    expect(mine.body.orders.every((o: { customerId: number }) => o.customerId === customerId)).toBe(true);
    const all = await operator.get('/api/orders').expect(200);
    expect(all.body.total).toBe(mine.body.total + 1);
  });

  it('answers 404 for another customer’s order, the same as for an order that does not exist', async () => {
    const theirs = (await other.post('/api/orders', {}).expect(201)).body.id as number;
    const res = await customer.get(`/api/orders/${theirs}`);
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.detail).toBe(`No order with id ${theirs}.`);
    const none = await customer.get('/api/orders/9999');
    expect(none.body.detail).toBe('No order with id 9999.');
  });

  it('makes staff name the customer an order is for', async () => {
    const res = await operator.post('/api/orders', {});
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.customerId', message: 'Required when staff place an order' },
    ]);
    const made = await operator.post('/api/orders', { customerId }).expect(201);
    expect(made.body.customerId).toBe(customerId);
  });

  it('pins the stock’s current published profile version on a new roll', async () => {
    const order = (await customer.post('/api/orders', {}).expect(201)).body.id as number;
    const res = await customer.post(`/api/orders/${order}/rolls`, {
      stockId: catalogue.stockId,
      ei: 400,
      pushPull: 1,
      format: '135-36',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      orderId: order,
      stockName: 'Testline 200',
      ei: 400,
      pushPull: 1,
      profileVersionId: catalogue.versionId,
      profileVersion: 1,
      status: 'awaiting-scans',
      base: { mode: 'auto', frameId: null, region: null, measured: null },
    });
    const detail = await customer.get(`/api/orders/${order}`).expect(200);
    expect(detail.body.rolls).toHaveLength(1);
    expect(detail.body.order.rollCount).toBe(1);
  });

  it('refuses a roll of a stock with no published profile version with a 422 problem', async () => {
    const order = (await customer.post('/api/orders', {}).expect(201)).body.id as number;
    const res = await customer.post(`/api/orders/${order}/rolls`, {
      stockId: catalogue.unpublishedStockId,
      ei: 400,
      format: '135-36',
    });
    expect(res.status).toBe(422);
    expect(res.body.code).toBe('no-published-profile');
    expect(res.body.detail).toBe(
      'Draftline 400 has no published profile version yet; publish one before adding rolls of it.',
    );
  });

  it('does not let a customer add a roll to someone else’s order', async () => {
    const theirs = (await other.post('/api/orders', {}).expect(201)).body.id as number;
    const res = await customer.post(`/api/orders/${theirs}/rolls`, {
      stockId: catalogue.stockId,
      ei: 200,
      format: '135-36',
    });
    expect(res.status).toBe(404);
  });

  it('lets staff move an order on, audited, and filters the list by status', async () => {
    const order = (await customer.post('/api/orders', {}).expect(201)).body.id as number;
    const res = await operator.patch(`/api/orders/${order}`, { status: 'developing' });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('developing');
    const developing = await operator.get('/api/orders?status=developing').expect(200);
    expect(developing.body.orders.map((o: { id: number }) => o.id)).toContain(order);
    const audit = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'order-status-changed')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(audit.details!)).toEqual({ before: 'received', after: 'developing' });
    expect(await customer.patch(`/api/orders/${order}`, { status: 'ready' }).then((r) => r.status)).toBe(403);
  });

  it('sends ready through marking ready and hands over only a ready order, changing nothing otherwise', async () => {
    const order = (await customer.post('/api/orders', {}).expect(201)).body.id as number;
    const ready = await operator.patch(`/api/orders/${order}`, { status: 'ready' });
    expect(ready.status).toBe(409);
    expect(ready.body).toMatchObject({ code: 'mark-ready-instead' });
    const delivered = await operator.patch(`/api/orders/${order}`, { status: 'delivered' });
    expect(delivered.status).toBe(409);
    expect(delivered.body.detail).toBe(
      `Order ${order} is received; only a ready order can be delivered. Mark it ready first.`,
    );
    expect((await operator.get(`/api/orders/${order}`).expect(200)).body.order.status).toBe('received');
  });
});
