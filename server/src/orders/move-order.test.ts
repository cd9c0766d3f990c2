import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readPriceList } from '../prices/price-list-store';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { moveOrder } from './move-order';
import { insertOrder } from './order-repository';

let t: TestApp;
let customerId: number;
beforeAll(async () => {
  t = await createTestApp();
  customerId = await addUser(t.db, 'customer');
});
afterAll(() => t.close());

async function newOrder(): Promise<number> {
  const row = await insertOrder(t.db, {
    customerId,
    notes: '',
    outputFormats: ['jpeg'],
    scanSize: 'standard',
    at: t.clock.now(),
    priceList: await readPriceList(t.db),
  });
  return row.id;
}

const statusOf = async (id: number) =>
  (await t.db.selectFrom('orders').select('status').where('id', '=', id).executeTakeFirstOrThrow()).status;
const auditOf = (id: number) =>
  t.db.selectFrom('audit_log').selectAll().where('target', '=', `order:${id}`).orderBy('id').execute();

describe('moving an order', () => {
  it('changes the status and audits it in one step, as the system when no one acts', async () => {
    const id = await newOrder();
    expect(
      await moveOrder(t.db, {
        orderId: id,
        from: 'received',
        to: 'scanning',
        actor: null,
        at: t.clock.now(),
      }),
    ).toBe(true);
    expect(await statusOf(id)).toBe('scanning');
    const [audit] = await auditOf(id);
    expect(audit).toMatchObject({ action: 'order-status-changed', actor_id: null });
    expect(JSON.parse(audit!.details!)).toEqual({ before: 'received', after: 'scanning', by: 'system' });
  });

  it('writes nothing when the order moved on meanwhile, so a concurrent change is not overwritten', async () => {
    const id = await newOrder();
    await moveOrder(t.db, { orderId: id, from: 'received', to: 'cancelled', actor: null, at: t.clock.now() });
    expect(
      await moveOrder(t.db, { orderId: id, from: 'received', to: 'tuning', actor: null, at: t.clock.now() }),
    ).toBe(false);
    expect(await statusOf(id)).toBe('cancelled');
    expect(await auditOf(id)).toHaveLength(1);
  });
});
