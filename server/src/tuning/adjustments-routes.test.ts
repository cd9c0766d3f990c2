import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobRunner } from '../jobs/job-runner';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { until } from '../test-support/until';

let t: TestApp;
let operator: Client;
let runner: JobRunner;
let roll: number;
let frames: number[];

/** The roll's detail once its inversion job is done. */
const settled = () =>
  until(async () => {
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    return body.job?.state === 'done' && body;
  }, 30_000);

beforeAll(async () => {
  t = await createTestApp();
  const { customerId, stockId, ...lab } = await addTestLab(t);
  operator = lab.operator;
  ({ roll, frames } = await addRollWithScans(operator, {
    customerId,
    stockId,
    scans: [
      { name: 'a.tif', seed: 1 },
      { name: 'b.tif', seed: 2 },
    ],
  }));
  runner = await startTestJobRunner(t);
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

  it('reads adjustments saved before the black and white point shifts existed as shifts of 0, and renders them', async () => {
    const older = JSON.stringify({
      balance: { cyanRed: 0, magentaGreen: 2, yellowBlue: 0 },
      exposureStops: 0,
      contrast: null,
    });
    await t.db.updateTable('rolls').set({ adjustments: older }).where('id', '=', roll).execute();
    await t.db.updateTable('frames').set({ adjustments: older }).where('id', '=', frames[1]!).execute();
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    expect(body.roll.adjustments).toMatchObject({ blackPointStops: 0, whitePointStops: 0 });
    expect(body.frames[1].adjustments).toMatchObject({ blackPointStops: 0, whitePointStops: 0 });
    await operator.post(`/api/rolls/${roll}/invert`, { frames: 'all' }).expect(202);
    const detail = await settled();
    expect(detail.frames.map((f: { status: string }) => f.status)).toEqual(['done', 'done']);
  });
});
