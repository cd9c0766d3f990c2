import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { parsePositiveXmp } from '../imaging/index';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { until } from '../test-support/until';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import type { JobRunner } from './job-runner';

let t: TestApp;
let operator: Client;
let customer: Client;
let stranger: Client;
let runner: JobRunner;
let stockId: number;
let customerId: number;

async function rollWithFrames(n: number, formats: string[] = ['jpeg', 'tiff16']): Promise<number> {
  const order = (await operator.post('/api/orders', { customerId, outputFormats: formats }).expect(201)).body
    .id as number;
  const roll = (
    await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201)
  ).body.id as number;
  let req = operator.send('post', `/api/rolls/${roll}/frames`);
  for (let i = 1; i <= n; i++)
    req = req.attach('files', await negativeTiff({ seed: 100 * roll + i }), `f${i}.tif`);
  await req.expect(201);
  return roll;
}

const jobOf = async (roll: number) => (await operator.get(`/api/rolls/${roll}`).expect(200)).body;

beforeAll(async () => {
  t = await createTestApp({ JOB_CONCURRENCY: '1' });
  customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'customer', 'ines@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  operator = await signedIn(t.app, 'oskar@lab.test');
  customer = await signedIn(t.app, 'cass@lab.test');
  stranger = await signedIn(t.app, 'ines@lab.test');
  runner = await startTestJobRunner(t);
});
afterAll(async () => {
  await runner.stop();
  await t.close();
});

describe('batch inversion', () => {
  it('inverts every frame of a roll, writes the preview and the ordered formats, and marks the roll inverted', async () => {
    const roll = await rollWithFrames(3);
    const started = await operator.post(`/api/rolls/${roll}/invert`, {});
    expect(started.status).toBe(202);
    expect(started.body).toMatchObject({ kind: 'invert-roll', target: `roll:${roll}`, state: 'queued' });
    expect(started.body.progress).toEqual({ done: 0, failed: 0, total: 3 });

    const detail = await until(async () => {
      const d = await jobOf(roll);
      return d.job.state === 'done' && d;
    });
    expect(detail.job.progress).toEqual({ done: 3, failed: 0, total: 3 });
    expect(detail.roll.status).toBe('inverted');
    for (const frame of detail.frames) {
      expect(frame).toMatchObject({
        status: 'done',
        attempts: 1,
        outputs: ['jpeg', 'tiff16'],
        base: { source: 'frame' },
      });
    }
    const frameId = detail.frames[0].id as number;
    // staff read the files: a customer gets them once the order is released (ready and paid)
    const preview = await operator.get(`/api/frames/${frameId}/preview`).expect(200);
    expect(preview.headers['content-type']).toBe('image/jpeg');
    const meta = await sharp(preview.body as Buffer).metadata();
    expect([meta.width, meta.height]).toEqual([96, 64]);
    const tiff = await operator.get(`/api/frames/${frameId}/output?format=tiff16`);
    expect(tiff.status).toBe(200);
    expect(tiff.headers['content-disposition']).toBe('attachment; filename=f1.tif');
    expect((await sharp(tiff.body as Buffer).metadata()).depth).toBe('ushort');
    const xmp = (await sharp(tiff.body as Buffer).metadata()).xmpAsString ?? '';
    expect(parsePositiveXmp(xmp)).toMatchObject({
      stock: 'Clearbase Polyclear 200',
      profileVersion: 'testline@1',
      sourceFile: 'f1.tif',
      adjustments: { roll: { exposureStops: 0 }, frame: { exposureStops: 0 } },
    });
    const jpeg = await operator.get(`/api/frames/${frameId}/output?format=jpeg`).expect(200);
    const jpegMeta = await sharp(jpeg.body as Buffer).metadata();
    expect([jpegMeta.width, jpegMeta.height, jpegMeta.space, jpegMeta.hasProfile]).toEqual([
      96,
      64,
      'srgb',
      true,
    ]);
    expect(parsePositiveXmp(jpegMeta.xmpAsString ?? '')).toMatchObject({ profileVersion: 'testline@1' });
    expect((await operator.get(`/api/frames/${frameId}/output?format=png16`)).status).toBe(404);
    expect(readdirSync(join(t.config.dataDir, 'tmp'))).toEqual([]);
  });

  it('keeps another customer from a frame, its preview and its outputs', async () => {
    const roll = await rollWithFrames(1, ['jpeg']);
    const frameId = (await jobOf(roll)).frames[0].id as number;
    for (const path of [
      `/api/frames/${frameId}`,
      `/api/frames/${frameId}/preview`,
      `/api/frames/${frameId}/output`,
    ]) {
      expect((await stranger.get(path)).status).toBe(404);
    }
    expect((await stranger.get(`/api/rolls/${roll}`)).status).toBe(404);
    expect((await customer.get(`/api/rolls/${roll}`)).status).toBe(200);
  });

  it('answers 404 for outputs until the frame is done', async () => {
    const roll = await rollWithFrames(1, ['jpeg']);
    const frameId = (await jobOf(roll)).frames[0].id as number;
    const res = await operator.get(`/api/frames/${frameId}/output?format=jpeg`);
    expect(res.status).toBe(404);
    expect(res.body.detail).toBe(`Frame ${frameId} has not been inverted yet.`);
    const neg = await operator.get(`/api/frames/${frameId}/negative-preview`).expect(200);
    expect(neg.headers['content-type']).toBe('image/jpeg');
  });

  it('answers the running job again instead of starting a second one', async () => {
    const roll = await rollWithFrames(2, ['jpeg']);
    const a = await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
    const b = await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
    expect(b.body.id).toBe(a.body.id);
    await until(async () => (await jobOf(roll)).job.state === 'done');
    const again = await operator.post(`/api/rolls/${roll}/invert`, { frames: 'all' }).expect(202);
    expect(again.body.id).not.toBe(a.body.id);
    expect(again.body.progress.total).toBe(2);
    await until(async () => (await jobOf(roll)).job.state === 'done');
  });

  it('cancels a queued job at once, and refuses to cancel a finished one', async () => {
    await runner.stop();
    try {
      const roll = await rollWithFrames(1, ['jpeg']);
      const job = (await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202)).body.id as number;
      const res = await operator.post(`/api/jobs/${job}/cancel`);
      expect(res.status).toBe(202);
      expect(res.body.state).toBe('cancelled');
      const again = await operator.post(`/api/jobs/${job}/cancel`);
      expect(again.status).toBe(409);
      expect((await jobOf(roll)).frames[0].status).toBe('queued');
    } finally {
      await runner.start();
    }
  });
});
