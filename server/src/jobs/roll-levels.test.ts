import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addOrderTestLab, addRollWithScans } from '../orders/order-test-fixtures';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import type { JobRunner } from './job-runner';

let t: TestApp;
let operator: Client;
let runner: JobRunner;
let roll: number;
let frames: number[];

async function settled(jobId: number) {
  const end = Date.now() + 30_000;
  for (;;) {
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    if (body.job?.id === jobId && body.job.state === 'done') return body;
    if (Date.now() > end) throw new Error('job did not finish');
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** Mean of the green channel of a frame's preview, 0..255. */
async function previewMean(frameId: number): Promise<number> {
  const jpeg = (await operator.get(`/api/frames/${frameId}/preview`).expect(200)).body as Buffer;
  return (await sharp(jpeg).stats()).channels[1]!.mean;
}

beforeAll(async () => {
  t = await createTestApp();
  const { customerId, stockId, ...lab } = await addOrderTestLab(t);
  operator = lab.operator;
  // the same scene, grain and dust a stop apart: on frames this small, specks of dust move the white point
  ({ roll, frames } = await addRollWithScans(operator, {
    customerId,
    stockId,
    scans: [
      { name: 'normal.tif', seed: 5, exposureStops: 0 },
      { name: 'one-over.tif', seed: 5, exposureStops: 1 },
    ],
  }));
  runner = await startTestJobRunner(t);
});
afterAll(async () => {
  await runner.stop();
  await t.close();
});

describe('levels of a whole roll', () => {
  it('keep a frame shot a stop over lighter than its neighbour, where each frame’s own levels even them out', async () => {
    const own = (await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202)).body.id as number;
    await settled(own);
    const ownDifference = (await previewMean(frames[1]!)) - (await previewMean(frames[0]!));

    const together = await operator
      .post(`/api/rolls/${roll}/invert`, { frames: 'all', levels: 'roll' })
      .expect(202);
    await settled(together.body.id as number);
    const rollDifference = (await previewMean(frames[1]!)) - (await previewMean(frames[0]!));

    expect(Math.abs(ownDifference)).toBeLessThan(8);
    expect(rollDifference).toBeGreaterThan(15);
  });
});
