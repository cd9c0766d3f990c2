import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createJobRunner, type JobRunner } from '../jobs/job-runner';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let operator: Client;
let runner: JobRunner;
let roll: number;
let frames: number[];

async function settled() {
  const end = Date.now() + 30_000;
  for (;;) {
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    if (body.job?.state === 'done') return body;
    if (Date.now() > end) throw new Error('job did not finish');
    await new Promise((r) => setTimeout(r, 25));
  }
}

beforeAll(async () => {
  t = await createTestApp();
  const customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  const { stockId } = await addTestCatalogue(t.db);
  operator = await signedIn(t.app, 'oskar@lab.test');
  const order = (await operator.post('/api/orders', { customerId }).expect(201)).body.id as number;
  roll = (
    await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201)
  ).body.id as number;
  const up = await operator
    .send('post', `/api/rolls/${roll}/frames`)
    .attach('files', await negativeTiff({ seed: 1 }), 'a.tif')
    .attach('files', await negativeTiff({ seed: 2 }), 'b.tif')
    .expect(201);
  frames = up.body.accepted.map((a: { frameId: number }) => a.frameId);
  runner = createJobRunner({
    db: t.db,
    config: { ...t.config, jobConcurrency: 1 },
    clock: { now: () => new Date() },
    logger: pino({ level: 'silent' }),
    threads: 1,
    pollMs: 50,
  });
  await runner.start();
  await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
  await settled();
});
afterAll(async () => {
  await runner.stop();
  await t.close();
});

describe('tuning', () => {
  it('puts a tuned frame back in the queue and renders it again, warmer, leaving the others as they were', async () => {
    const before = (await operator.get(`/api/frames/${frames[0]}/preview`).expect(200)).body as Buffer;
    const res = await operator.send('put', `/api/frames/${frames[0]}/adjustments`, {
      balance: { cyanRed: 12, magentaGreen: 0, yellowBlue: -12 },
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      status: 'queued',
      adjustments: {
        balance: { cyanRed: 12, magentaGreen: 0, yellowBlue: -12 },
        exposureStops: 0,
        contrast: null,
      },
    });
    const job = await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
    expect(job.body.progress.total).toBe(1);
    const detail = await settled();
    expect(detail.frames.map((f: { status: string }) => f.status)).toEqual(['done', 'done']);
    const after = (await operator.get(`/api/frames/${frames[0]}/preview`).expect(200)).body as Buffer;
    expect(after.equals(before)).toBe(false);
  });

  it('refuses adjustments out of range, naming the field', async () => {
    const res = await operator.send('put', `/api/rolls/${roll}/adjustments`, { exposureStops: 9 });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('body.exposureStops');
  });

  it('queues every frame of a tuned roll again', async () => {
    const res = await operator.send('put', `/api/rolls/${roll}/adjustments`, { exposureStops: 0.5 });
    expect(res.status).toBe(200);
    expect(res.body.adjustments.exposureStops).toBe(0.5);
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    expect(body.frames.map((f: { status: string }) => f.status)).toEqual(['queued', 'queued']);
  });
});
