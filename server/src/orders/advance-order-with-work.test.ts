import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobRunner } from '../jobs/job-runner';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { until } from '../test-support/until';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import { addOrderTestLab, negativeTiff } from './order-test-fixtures';

let t: TestApp;
let operator: Client;
let runner: JobRunner;
let stockId: number;
let customerId: number;

async function orderWithRolls(rolls: number): Promise<{ order: number; rolls: number[] }> {
  const order = (await operator.post('/api/orders', { customerId, outputFormats: ['jpeg'] }).expect(201)).body
    .id as number;
  const ids: number[] = [];
  for (let i = 0; i < rolls; i++)
    ids.push(
      (await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201))
        .body.id as number,
    );
  return { order, rolls: ids };
}

async function upload(roll: number, seed: number): Promise<void> {
  await operator
    .send('post', `/api/rolls/${roll}/frames`)
    .attach('files', await negativeTiff({ seed }), `f${seed}.tif`)
    .expect(201);
}

async function invert(roll: number): Promise<void> {
  await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
  await until(async () => (await operator.get(`/api/rolls/${roll}`).expect(200)).body.job?.state === 'done');
}

const statusOf = async (order: number) =>
  (await operator.get(`/api/orders/${order}`).expect(200)).body.order.status as string;

const systemChanges = (order: number) =>
  t.db
    .selectFrom('audit_log')
    .selectAll()
    .where('action', '=', 'order-status-changed')
    .where('target', '=', `order:${order}`)
    .where('actor_id', 'is', null)
    .orderBy('id')
    .execute();

beforeAll(async () => {
  t = await createTestApp({ JOB_CONCURRENCY: '1' });
  ({ customerId, stockId, operator } = await addOrderTestLab(t));
  runner = await startTestJobRunner(t);
});
afterAll(async () => {
  await runner.stop();
  await t.close();
});

describe('an order’s status follows its work', () => {
  it('moves to scanning on the first upload and to tuning once every roll is inverted, audited as the system', async () => {
    const { order, rolls } = await orderWithRolls(2);
    await operator.patch(`/api/orders/${order}`, { status: 'developing' }).expect(200);

    await upload(rolls[0]!, 1);
    expect(await statusOf(order)).toBe('scanning');
    await invert(rolls[0]!);
    // the second roll has no scans yet, so the order is still being scanned
    expect(await statusOf(order)).toBe('scanning');

    await upload(rolls[1]!, 2);
    expect(await statusOf(order)).toBe('scanning');
    await invert(rolls[1]!);
    expect(await statusOf(order)).toBe('tuning');

    const changes = await systemChanges(order);
    expect(
      changes.map((c) => JSON.parse(c.details!) as { before: string; after: string; by: string }),
    ).toEqual([
      expect.objectContaining({ before: 'developing', after: 'scanning', by: 'system' }),
      expect.objectContaining({ before: 'scanning', after: 'tuning', by: 'system' }),
    ]);
  });

  it('never moves an order backwards or past tuning when more scans arrive later', async () => {
    const { order, rolls } = await orderWithRolls(1);
    await upload(rolls[0]!, 3);
    await invert(rolls[0]!);
    expect(await statusOf(order)).toBe('tuning');

    // a late frame is not yet inverted, yet the order stays in tuning
    await upload(rolls[0]!, 4);
    expect(await statusOf(order)).toBe('tuning');
    await invert(rolls[0]!);
    expect(await statusOf(order)).toBe('tuning');
    expect(await systemChanges(order)).toHaveLength(2);
  });

  it('leaves an order staff marked ready alone', async () => {
    const { order, rolls } = await orderWithRolls(1);
    // as marking it ready leaves it; that needs approved, paid rolls, beside the point here
    await t.db.updateTable('orders').set({ status: 'ready' }).where('id', '=', order).execute();
    await upload(rolls[0]!, 5);
    await invert(rolls[0]!);
    expect(await statusOf(order)).toBe('ready');
    expect(await systemChanges(order)).toHaveLength(0);
  });
});
