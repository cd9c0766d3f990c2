import type { RollTuning } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addOrderTestLab, addRollWithScans } from '../orders/order-test-fixtures';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let operator: Client;
let order: number;
let roll: number;
let frames: number[];

beforeAll(async () => {
  t = await createTestApp();
  const lab = await addOrderTestLab(t);
  operator = lab.operator;
  ({ order, roll, frames } = await addRollWithScans(operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: [
      { name: 'a.tif', seed: 1 },
      { name: 'b.tif', seed: 2 },
    ],
  }));
  await t.db.updateTable('orders').set({ status: 'tuning' }).where('id', '=', order).execute();
  // the lab takes payment on collection, so approving every roll readies the order
  await t.db
    .insertInto('settings')
    .values({
      key: 'lab',
      value: JSON.stringify({ name: 'Test lab', town: '', address: '', payOnCollection: true }),
    })
    .execute();
});
afterAll(() => t.close());

describe('frame review', () => {
  it('refuses to approve a frame not rendered yet', async () => {
    const res = await operator.post(`/api/frames/${frames[0]}/review`, { decision: 'approved' });
    expect(res.status).toBe(409);
    expect(res.body.code ?? res.body.type).toBeTruthy();
  });

  it('asks for a note with a rejection, naming the field', async () => {
    const res = await operator.post(`/api/frames/${frames[0]}/review`, { decision: 'rejected', note: '' });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.note', message: 'Say what is wrong with a rejected frame' },
    ]);
  });

  it('approves the roll and readies the order when every frame is approved or excluded, and takes it back', async () => {
    await t.db.updateTable('frames').set({ status: 'done' }).where('id', '=', frames[0]!).execute();
    const first = await operator
      .post(`/api/frames/${frames[0]}/review`, { decision: 'approved', note: 'fine' })
      .expect(200);
    expect(first.body.rollApproved).toBe(false);
    expect(first.body.frame.review).toMatchObject({
      decision: 'approved',
      note: 'fine',
      reviewedBy: 'Test operator',
    });
    const second = await operator
      .post(`/api/frames/${frames[1]}/review`, { decision: 'excluded', note: 'blank leader' })
      .expect(200);
    expect(second.body.rollApproved).toBe(true);
    const sheet = (await operator.get(`/api/rolls/${roll}/tuning`).expect(200)).body as RollTuning;
    expect(sheet.approved).toBe(true);
    expect((await operator.get(`/api/orders/${order}`).expect(200)).body.order.status).toBe('ready');

    await operator
      .post(`/api/frames/${frames[0]}/review`, { decision: 'rejected', note: 'scratch across the sky' })
      .expect(200);
    expect((await operator.get(`/api/orders/${order}`).expect(200)).body.order.status).toBe('tuning');
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('action', '=', 'frame-reviewed')
      .execute();
    expect(audit).toHaveLength(3);
  });
});
