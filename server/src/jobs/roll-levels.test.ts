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

describe('a roll at the metered exposure', () => {
  it('prints a frame shot a stop over and taken back a stop by its own exposure as the same grey as its neighbour, where each frame’s levels would not', async () => {
    await operator.send('put', `/api/frames/${frames[1]}/adjustments`, { exposureStops: -1 }).expect(200);

    const own = await operator
      .post(`/api/rolls/${roll}/invert`, { frames: 'all', levels: 'frame' })
      .expect(202);
    await settled(own.body.id as number);
    const ownDifference = (await previewMean(frames[1]!)) - (await previewMean(frames[0]!));

    const metered = await operator
      .post(`/api/rolls/${roll}/invert`, { frames: 'all', levels: 'metered' })
      .expect(202);
    await settled(metered.body.id as number);
    const meteredDifference = (await previewMean(frames[1]!)) - (await previewMean(frames[0]!));

    // each frame's levels even the exposures out, so the frame's −1 stop prints it a stop darker
    expect(ownDifference).toBeLessThan(-15);
    expect(Math.abs(meteredDifference)).toBeLessThan(8);
    // and the normal frame prints near mid grey on the preview's 0..255 scale, neither blocked up nor washed out
    const normal = await previewMean(frames[0]!);
    expect(normal).toBeGreaterThan(60);
    expect(normal).toBeLessThan(190);
  });

  it('refuses a levels choice it does not know, naming the field', async () => {
    const res = await operator.send('post', `/api/rolls/${roll}/invert`, { levels: 'fixed' });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toContain('levels');
  });
});
