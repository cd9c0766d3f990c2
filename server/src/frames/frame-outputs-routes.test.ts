import { frameOutputRegionHeaders } from '@clearbase/contracts';
import type { Response } from 'supertest';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobRunner } from '../jobs/job-runner';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { until } from '../test-support/until';

let t: TestApp;
let operator: Client;
let customer: Client;
let runner: JobRunner;
let frame: number;
let pending: number;
let tiff: Buffer;

/** Collects a binary body as a Buffer. */
const binary = (res: Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
};
const region = (query: string, headers: Record<string, string> = {}) => {
  let req = operator.get(`/api/frames/${frame}/outputs/full?${query}`).buffer(true).parse(binary);
  for (const [k, v] of Object.entries(headers)) req = req.set(k, v);
  return req;
};

beforeAll(async () => {
  t = await createTestApp();
  const { customerId, stockId, ...lab } = await addTestLab(t);
  operator = lab.operator;
  customer = await signedIn(t.app, 'cass@lab.test');
  const rendered = await addRollWithScans(operator, {
    customerId,
    stockId,
    scans: [{ name: 'harbour.tif', seed: 3 }],
    outputFormats: ['tiff16'],
  });
  frame = rendered.frames[0]!;
  runner = await startTestJobRunner(t);
  await operator.post(`/api/rolls/${rendered.roll}/invert`, {}).expect(202);
  await until(async () => {
    const { body } = await operator.get(`/api/rolls/${rendered.roll}`).expect(200);
    return body.job?.state === 'done' && body;
  }, 30_000);
  pending = (
    await addRollWithScans(operator, { customerId, stockId, scans: [{ name: 'later.tif', seed: 4 }] })
  ).frames[0]!;
  tiff = (
    await operator.get(`/api/frames/${frame}/output?format=tiff16`).buffer(true).parse(binary).expect(200)
  ).body as Buffer;
});
afterAll(async () => {
  await runner.stop();
  await t.close();
});

describe('a frame’s full-size output', () => {
  it('is asked for again each time and answers 304 while its bytes are the same', async () => {
    const res = await operator.get(`/api/frames/${frame}/output?format=tiff16`).buffer(true).parse(binary);
    expect(res.headers['cache-control']).toBe('private, no-cache');
    const etag = String(res.headers.etag);
    expect(etag).toMatch(/^"[0-9a-f]{64}"$/);
    await operator.get(`/api/frames/${frame}/output?format=tiff16`).set('If-None-Match', etag).expect(304);
  });
});

describe('a rectangle of the full-size positive at 1:1', () => {
  it('is cut from the 16-bit TIFF and sent as an 8-bit sRGB PNG with the whole positive’s size', async () => {
    const full = await sharp(tiff).metadata();
    const res = await region('x=10&y=5&width=20&height=12').expect(200);
    expect(res.headers['content-type']).toBe('image/png');
    expect(res.headers[frameOutputRegionHeaders.width.toLowerCase()]).toBe(String(full.width));
    expect(res.headers[frameOutputRegionHeaders.height.toLowerCase()]).toBe(String(full.height));
    const got = await sharp(res.body as Buffer)
      .raw()
      .toBuffer({ resolveWithObject: true });
    expect([got.info.width, got.info.height, got.info.channels]).toEqual([20, 12, 3]);
    const expected = await sharp(tiff)
      .extract({ left: 10, top: 5, width: 20, height: 12 })
      .toColourspace('srgb')
      .raw()
      .toBuffer();
    expect(got.data.equals(expected)).toBe(true);
  });

  it('comes as JPEG when asked', async () => {
    const res = await region('x=0&y=0&width=16&height=16&format=jpeg').expect(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    expect((await sharp(res.body as Buffer).metadata()).width).toBe(16);
  });

  it('is asked for again each time and answers 304 while the output is the same', async () => {
    const first = await region('x=1&y=1&width=8&height=8').expect(200);
    expect(first.headers['cache-control']).toBe('private, no-cache');
    const again = await region('x=1&y=1&width=8&height=8', { 'If-None-Match': String(first.headers.etag) });
    expect(again.status).toBe(304);
    const other = await region('x=2&y=1&width=8&height=8', { 'If-None-Match': String(first.headers.etag) });
    expect(other.status).toBe(200);
  });

  it('refuses a rectangle past the positive’s edge, naming the field', async () => {
    const full = await sharp(tiff).metadata();
    const res = await operator.get(
      `/api/frames/${frame}/outputs/full?x=${full.width! - 4}&y=0&width=8&height=8`,
    );
    expect(res.status).toBe(422);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(['query.width']);
  });

  it('refuses a rectangle that is not whole pixels or too large, naming the field', async () => {
    const half = await operator.get(`/api/frames/${frame}/outputs/full?x=0.5&y=0&width=8&height=8`);
    expect(half.status).toBe(400);
    expect(half.body.errors[0]).toEqual({ path: 'query.x', message: 'Give a whole number of pixels' });
    const huge = await operator.get(`/api/frames/${frame}/outputs/full?x=0&y=0&width=5000&height=5000`);
    expect(huge.status).toBe(400);
    expect(huge.body.errors[0].path).toBe('query.width');
  });

  it('answers 404 for a frame not rendered yet, and is for lab staff only', async () => {
    const res = await operator.get(`/api/frames/${pending}/outputs/full?x=0&y=0&width=8&height=8`);
    expect(res.status).toBe(404);
    expect(res.body.title ?? res.body.detail).toBeTruthy();
    expect((await customer.get(`/api/frames/${frame}/outputs/full?x=0&y=0&width=8&height=8`)).status).toBe(
      403,
    );
  });
});
