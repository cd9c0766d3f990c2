import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { createTestApp, type TestApp } from '../test-support/test-app';
import { seedDemo } from './seed';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db, { clock: t.clock });
});
afterAll(() => t.close());

describe('demo orders', () => {
  it('give the demo customer orders in several states', async () => {
    const orders = await t.db
      .selectFrom('orders')
      .innerJoin('users', 'users.id', 'orders.customer_id')
      .select(['orders.status', 'users.email'])
      .execute();
    expect(orders.map((o) => o.status).sort()).toEqual(['delivered', 'developing', 'received', 'tuning']);
    expect(new Set(orders.map((o) => o.email))).toEqual(new Set(['customer@clearbase.test']));
  });

  it('hold a roll of generated negatives queued for inversion, which the queue inverts on start', async () => {
    const frames = await t.db.selectFrom('frames').selectAll().orderBy('frame_index').execute();
    expect(frames.map((f) => f.file_name)).toEqual([
      'chart.tif',
      'grey-steps.tif',
      'gradient.tif',
      'harbour-wall.tif',
    ]);
    expect(frames.every((f) => f.status === 'queued' && f.bit_depth === 16)).toBe(true);
    const runner = await startTestJobRunner(t);
    try {
      const end = Date.now() + 60_000;
      for (;;) {
        const job = await t.db.selectFrom('jobs').select('state').executeTakeFirstOrThrow();
        if (job.state === 'done') break;
        if (Date.now() > end) throw new Error(`demo roll not inverted (job ${job.state})`);
        await new Promise((r) => setTimeout(r, 50));
      }
    } finally {
      await runner.stop();
    }
    const after = await t.db.selectFrom('frames').select(['status', 'base_source']).execute();
    expect(after.every((f) => f.status === 'done')).toBe(true);
    const roll = await t.db.selectFrom('rolls').select('status').executeTakeFirstOrThrow();
    expect(['inverted', 'needs-attention']).toContain(roll.status);
  }, 90_000);
});
