import type { RollTuning } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { downsampleNegative } from './working-negative';
import { decodeWorkingNegative, encodeWorkingNegative } from './working-negative-cache';

let t: TestApp;
let operator: Client;
let customer: Client;
let order: number;
let roll: number;
let frames: number[];

beforeAll(async () => {
  t = await createTestApp();
  const customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  const { stockId } = await addTestCatalogue(t.db);
  operator = await signedIn(t.app, 'oskar@lab.test');
  customer = await signedIn(t.app, 'cass@lab.test');
  order = (await operator.post('/api/orders', { customerId }).expect(201)).body.id as number;
  roll = (
    await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201)
  ).body.id as number;
  const up = await operator
    .send('post', `/api/rolls/${roll}/frames`)
    .attach('files', await negativeTiff({ width: 96, height: 64, seed: 1 }), 'a.tif')
    .attach('files', await negativeTiff({ width: 96, height: 64, seed: 2 }), 'b.tif')
    .expect(201);
  frames = (up.body.accepted as { frameId: number }[]).map((a) => a.frameId);
  await t.db.updateTable('orders').set({ status: 'tuning' }).where('id', '=', order).execute();
});
afterAll(() => t.close());

describe('tuning sheet', () => {
  it('holds the pinned profile, the scanner, the roll and each frame with no review yet', async () => {
    const res = await operator.get(`/api/rolls/${roll}/tuning`).expect(200);
    const sheet = res.body as RollTuning;
    expect(sheet.roll.id).toBe(roll);
    expect(sheet.profile.curves.green.points.length).toBeGreaterThan(1);
    expect(sheet.scanner.encoding).toBe('linear');
    expect(sheet.frames.map((f) => f.id)).toEqual(frames);
    expect(sheet.frames.every((f) => f.review === null)).toBe(true);
    expect(sheet.approved).toBe(false);
  });

  it('is for lab staff only', async () => {
    const res = await customer.get(`/api/rolls/${roll}/tuning`);
    expect(res.status).toBe(403);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  });
});

describe('working negative store', () => {
  it('reads back what it stores, and takes other bytes for no working negative', () => {
    const working = { width: 2, height: 1, data: Uint16Array.from([1, 2, 3, 4, 5, 65535]) };
    const sample = { width: 1, height: 1, data: Uint16Array.from([7, 8, 9]) };
    const bytes = encodeWorkingNegative(working, sample, { width: 4, height: 2 });
    const back = decodeWorkingNegative(bytes)!;
    expect([back.width, back.height, back.scanWidth, back.scanHeight]).toEqual([2, 1, 4, 2]);
    expect(back.pixels.readUInt16LE(10)).toBe(65535);
    expect(Array.from(back.sample.data)).toEqual([7, 8, 9]);
    expect(decodeWorkingNegative(bytes.subarray(0, bytes.length - 1))).toBeNull();
    expect(decodeWorkingNegative(Buffer.from('not a working negative'))).toBeNull();
  });

  it('reduces a large scan by a whole factor, each pixel the mean of its block', () => {
    const data = new Uint16Array(4 * 2 * 3);
    for (let i = 0; i < data.length; i++) data[i] = i * 100;
    const small = downsampleNegative({ width: 4, height: 2, data }, 2);
    expect([small.width, small.height]).toEqual([2, 1]);
    // block of pixels 0, 1, 4, 5 → red samples 0, 300, 1200, 1500
    expect(small.data[0]).toBe(750);
    expect(downsampleNegative({ width: 4, height: 2, data }, 1500).data).toBe(data);
  });
});
