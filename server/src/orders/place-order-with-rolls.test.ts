import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { addOrderTestLab } from './order-test-fixtures';

let t: TestApp;
let lab: Awaited<ReturnType<typeof addOrderTestLab>>;
let customer: Client;

const address = {
  name: 'Cass Verne',
  line1: '12 Lantern Yard',
  town: 'Millbrook',
  postcode: 'MB4 7QT',
  country: 'Testland',
};

async function counts(): Promise<{ orders: number; rolls: number; audit: number; outbox: number }> {
  const n = async (table: 'orders' | 'rolls' | 'audit_log' | 'outbox') =>
    Number(
      (
        await t.db
          .selectFrom(table)
          .select((eb) => eb.fn.countAll<number>().as('n'))
          .executeTakeFirstOrThrow()
      ).n,
    );
  return {
    orders: await n('orders'),
    rolls: await n('rolls'),
    audit: await n('audit_log'),
    outbox: await n('outbox'),
  };
}

beforeAll(async () => {
  t = await createTestApp();
  lab = await addOrderTestLab(t);
  customer = await signedIn(t.app, 'cass@lab.test');
});
afterAll(() => t.close());

describe('placing an order with its rolls in one request', () => {
  it('records the order, every roll pinned to its stock’s published version, and where the negatives go', async () => {
    const res = await customer.post('/api/orders', {
      outputFormats: ['jpeg'],
      scanSize: 'large',
      negatives: { method: 'post', address },
      rolls: [
        { stockId: lab.stockId, ei: 200, format: '135-36' },
        { stockId: lab.stockId, ei: 400, pushPull: 1, format: '120' },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      rollCount: 2,
      scanSize: 'large',
      negatives: { method: 'post', address: { ...address, line2: '' } },
    });
    const detail = await customer.get(`/api/orders/${res.body.id}`).expect(200);
    expect(detail.body.order.negatives.method).toBe('post');
    expect(
      detail.body.rolls.map(
        (r: { ei: number; pushPull: number; format: string; profileVersionId: number }) => [
          r.ei,
          r.pushPull,
          r.format,
          r.profileVersionId,
        ],
      ),
    ).toEqual([
      [200, 0, '135-36', lab.versionId],
      [400, 1, '120', lab.versionId],
    ]);
  });

  it('keeps the negatives at the lab for collection when nothing is said', async () => {
    const res = await customer.post('/api/orders', {}).expect(201);
    expect(res.body.negatives).toEqual({ method: 'collect' });
  });

  it('refuses a bad roll with the path of its field and writes nothing at all', async () => {
    const before = await counts();
    const res = await customer.post('/api/orders', {
      rolls: [
        { stockId: lab.stockId, ei: 200, format: '135-36' },
        { stockId: lab.stockId, ei: 0, format: '135-36' },
      ],
    });
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(['body.rolls.1.ei']);
    expect(await counts()).toEqual(before);
  });

  it('takes the whole order back when a later roll’s stock cannot be ordered, naming that roll’s stock', async () => {
    const before = await counts();
    const res = await customer.post('/api/orders', {
      rolls: [
        { stockId: lab.stockId, ei: 200, format: '135-36' },
        { stockId: lab.stockId, ei: 200, format: '135-24' },
        { stockId: lab.unpublishedStockId, ei: 400, format: '135-36' },
      ],
    });
    expect(res.status).toBe(422);
    expect(res.body.code).toBe('no-published-profile');
    expect(res.body.errors).toEqual([
      { path: 'body.rolls.2.stockId', message: 'Draftline 400 cannot be ordered yet' },
    ]);
    expect(await counts()).toEqual(before);
  });

  it('names a roll whose stock does not exist, and keeps nothing of the order', async () => {
    const before = await counts();
    const res = await customer.post('/api/orders', {
      rolls: [{ stockId: 9999, ei: 200, format: '135-36' }],
    });
    expect(res.status).toBe(404);
    expect(res.body.errors).toEqual([{ path: 'body.rolls.0.stockId', message: 'No such stock' }]);
    expect(await counts()).toEqual(before);
  });

  it('wants a postal address before it posts the negatives back', async () => {
    const res = await customer.post('/api/orders', {
      negatives: { method: 'post', address: { ...address, line1: '' } },
    });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.negatives.address.line1', message: 'Give the street and number' },
    ]);
  });

  it('lists staff the open customer accounts to order for, and keeps the list from customers', async () => {
    await addUser(t.db, 'customer', 'gone@lab.test', true);
    const list = await lab.operator.get('/api/orders/customers').expect(200);
    expect(list.body.customers).toEqual([
      { id: lab.customerId, name: 'Test customer', email: 'cass@lab.test' },
    ]);
    expect((await customer.get('/api/orders/customers')).status).toBe(403);
  });

  it('lets staff place an order with rolls for a customer', async () => {
    await addUser(t.db, 'manager', 'mira@lab.test');
    const manager = await signedIn(t.app, 'mira@lab.test');
    const res = await manager.post('/api/orders', {
      customerId: lab.customerId,
      rolls: [{ stockId: lab.stockId, ei: 100, pushPull: -1, format: '135-36' }],
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ customerId: lab.customerId, rollCount: 1 });
  });
});
