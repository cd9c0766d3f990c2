import { orderQuerySchema, type User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addTestCatalogue } from './order-test-fixtures';
import { createOrdersService } from './orders-service';

let t: TestApp;
let customer: User;
let other: User;
let operator: User;
let stockId: number;
const orders = () => createOrdersService({ db: t.db, clock: t.clock, config: t.config });
beforeAll(async () => {
  t = await createTestApp();
  customer = {
    id: await addUser(t.db, 'customer', 'c@example.test'),
    email: 'c@example.test',
    name: 'C',
    role: 'customer',
  };
  other = {
    id: await addUser(t.db, 'customer', 'o@example.test'),
    email: 'o@example.test',
    name: 'O',
    role: 'customer',
  };
  operator = {
    id: await addUser(t.db, 'operator'),
    email: 'operator@lab.test',
    name: 'Op',
    role: 'operator',
  };
  ({ stockId } = await addTestCatalogue(t.db));
});
afterAll(() => t.close());

const roll = () => ({ stockId, ei: 200, pushPull: 0, format: '135-36', scannerId: null });

describe('the orders service', () => {
  it('places an order with its rolls, audited, and mails the customer it was received', async () => {
    const order = await orders().place(customer, {
      outputFormats: ['jpeg'],
      scanSize: 'standard',
      notes: '',
      rolls: [roll()],
    } as never);
    expect(order).toMatchObject({ customerId: customer.id, status: 'received' });
    const mail = await t.db
      .selectFrom('outbox')
      .select('kind')
      .where('to_address', '=', customer.email)
      .execute();
    expect(mail.map((m) => m.kind)).toContain('order-received');
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('target', '=', `order:${order.id}`)
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['order-created']);
  });

  it('places nothing when one roll is refused', async () => {
    const before = (await orders().list(operator, orderQuerySchema.parse({}))).total;
    await expect(
      orders().place(customer, {
        outputFormats: ['jpeg'],
        scanSize: 'standard',
        notes: '',
        rolls: [roll(), { ...roll(), stockId: 99_999 }],
      } as never),
    ).rejects.toMatchObject({ status: 404, code: 'stock-not-found' });
    expect((await orders().list(operator, orderQuerySchema.parse({}))).total).toBe(before);
  });

  it('keeps customers to their own orders', async () => {
    await expect(
      orders().place(customer, {
        customerId: other.id,
        outputFormats: ['jpeg'],
        scanSize: 'standard',
        notes: '',
        rolls: [],
      } as never),
    ).rejects.toMatchObject({ status: 403 });
    const mine = await orders().place(customer, {
      outputFormats: ['jpeg'],
      scanSize: 'standard',
      notes: '',
      rolls: [],
    } as never);
    await expect(orders().detail(other, mine.id)).rejects.toMatchObject({ status: 404 });
    expect((await orders().list(other, orderQuerySchema.parse({}))).orders).toEqual([]);
  });

  it('lets a customer add rolls only while the order is received, staff at any time', async () => {
    const order = await orders().place(customer, {
      outputFormats: ['jpeg'],
      scanSize: 'standard',
      notes: '',
      rolls: [],
    } as never);
    await orders().move(operator, order.id, 'developing');
    await expect(orders().addRoll(customer, order.id, roll() as never)).rejects.toMatchObject({
      status: 409,
      code: 'order-in-progress',
    });
    expect((await orders().addRoll(operator, order.id, roll() as never)).orderId).toBe(order.id);
  });
});
