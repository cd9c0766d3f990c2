import { workingNegativeHeaders, type RollTuning } from '@clearbase/contracts';
import {
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  measureFrameLevels,
  pickNeutral,
  POLYCLEAR_200,
  profileForStock,
  type Rgb,
} from '@clearbase/inversion';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { createFileStore } from '../files/file-store';
import { frameNegative } from '../frames/frame-negative';
import { measureLevels } from '../inversion-pool/invert-negative-file';
import { downsampleNegative } from './working-negative';
import {
  decodeWorkingNegative,
  encodeWorkingNegative,
  workingNegativeCacheOf,
} from './working-negative-cache';

let t: TestApp;
let operator: Client;
let customer: Client;
let order: number;
let roll: number;
let frames: number[];

/** Collects a binary body as a Buffer. */
const binary = (res: Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
};

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

describe('working negative', () => {
  it('sends raw 16-bit RGB with its size, base, where the base came from and the levels of the full scan', async () => {
    const res = await operator
      .get(`/api/frames/${frames[0]}/working-negative`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    const width = Number(res.headers[workingNegativeHeaders.width.toLowerCase()]);
    const height = Number(res.headers[workingNegativeHeaders.height.toLowerCase()]);
    expect([width, height]).toEqual([96, 64]);
    expect((res.body as Buffer).length).toBe(width * height * 3 * 2);
    const base = String(res.headers[workingNegativeHeaders.base.toLowerCase()]).split(',').map(Number);
    expect(base.every((b) => b > 0 && b <= 1)).toBe(true);
    expect(res.headers[workingNegativeHeaders.baseSource.toLowerCase()]).toBe('frame');
    expect(res.headers[workingNegativeHeaders.scanSize.toLowerCase()]).toBe('96x64');
    const levels = JSON.parse(String(res.headers[workingNegativeHeaders.levels.toLowerCase()]));
    expect(levels.channelMeans).toHaveLength(3);
    expect(levels.whiteLogExposure).toBeGreaterThan(levels.blackLogExposure);
  });

  it('is made once per scan: requests together share one making, later ones read it from the store', async () => {
    const cache = workingNegativeCacheOf(createFileStore(t.config.dataDir));
    const get = () =>
      operator.get(`/api/frames/${frames[1]}/working-negative`).buffer(true).parse(binary).expect(200);
    const before = cache.made;
    const [a, b] = await Promise.all([get(), get()]);
    expect(cache.made).toBe(before + 1);
    const c = await get();
    expect(cache.made).toBe(before + 1);
    expect((b.body as Buffer).equals(a.body as Buffer)).toBe(true);
    expect((c.body as Buffer).equals(a.body as Buffer)).toBe(true);
    expect(c.headers[workingNegativeHeaders.levels.toLowerCase()]).toBe(
      a.headers[workingNegativeHeaders.levels.toLowerCase()],
    );
  });

  it('sends the levels of the full scan, as the roll job measures them', async () => {
    const res = await operator
      .get(`/api/frames/${frames[0]}/working-negative`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    const sheet = (await operator.get(`/api/rolls/${roll}/tuning`).expect(200)).body as RollTuning;
    const frame = (await t.db
      .selectFrom('frames')
      .selectAll()
      .where('id', '=', frames[0]!)
      .executeTakeFirst())!;
    const scan = await frameNegative(t.db, createFileStore(t.config.dataDir), frame, 1e8);
    const base = String(res.headers[workingNegativeHeaders.base.toLowerCase()]).split(',').map(Number);
    const full = measureLevels(
      scan,
      { profile: sheet.profile, scanner: sheet.scanner, render: 'print' },
      { rgb: base as Rgb, region: [0, 0, 0, 0], confidence: 1 },
    );
    expect(JSON.parse(String(res.headers[workingNegativeHeaders.levels.toLowerCase()]))).toEqual(full);
  });

  it('measures the base of a frame that has none on file from its full scan', async () => {
    const stored = await t.db
      .selectFrom('frames')
      .select('base_measured')
      .where('id', '=', frames[1]!)
      .executeTakeFirst();
    await t.db.updateTable('frames').set({ base_measured: null }).where('id', '=', frames[1]!).execute();
    try {
      const res = await operator
        .get(`/api/frames/${frames[1]}/working-negative`)
        .buffer(true)
        .parse(binary)
        .expect(200);
      expect(res.headers[workingNegativeHeaders.baseSource.toLowerCase()]).toBe('frame');
      const base = String(res.headers[workingNegativeHeaders.base.toLowerCase()]).split(',').map(Number);
      expect(base).toEqual((JSON.parse(stored!.base_measured!) as { rgb: number[] }).rgb);
    } finally {
      await t.db.updateTable('frames').set(stored!).where('id', '=', frames[1]!).execute();
    }
  });

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

describe('cast and exposure steps saved on a frame', () => {
  it('takes a neutral pick rounded to whole printer points and refuses the raw correction, naming the axis', async () => {
    const profile = {
      ...profileForStock(POLYCLEAR_200),
      balance: { cyanRed: 0, magentaGreen: 6.4, yellowBlue: 0 },
    };
    const negative = exposeNegative(greySteps(4, 0.05, 0.8, 12), {
      stock: POLYCLEAR_200,
      scanner: LINEAR_SCANNER,
    });
    const base = negative.truth.base;
    const levels = measureFrameLevels(
      { profile, scanner: LINEAR_SCANNER, base, render: 'print', outputBits: 8 },
      negative,
    );
    const pick = pickNeutral(negative, negative.truth.frame, {
      profile,
      scanner: LINEAR_SCANNER,
      base,
      midLogExposure: levels.midLogExposure,
      render: 'print',
      outputBits: 8,
    });
    expect(Number.isInteger(pick.correction.magentaGreen)).toBe(false);
    const raw = await operator.send('put', `/api/frames/${frames[1]}/adjustments`, {
      balance: pick.correction,
    });
    expect(raw.status).toBe(400);
    expect(raw.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(raw.body.errors).toContainEqual({
      path: 'body.balance.magentaGreen',
      message: 'Use whole printer points',
    });
    const saved = await operator
      .send('put', `/api/frames/${frames[1]}/adjustments`, { balance: pick.wholePoints })
      .expect(200);
    expect(saved.body.adjustments.balance).toEqual(pick.wholePoints);
  });

  it('refuses an exposure or a point shift off the 1/6-stop steps, naming the field', async () => {
    const res = await operator.send('put', `/api/frames/${frames[1]}/adjustments`, {
      exposureStops: 0.25,
      whitePointStops: 0.2,
    });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.exposureStops', message: 'Use steps of 1/6 stop' },
      { path: 'body.whitePointStops', message: 'Use steps of 1/6 stop' },
    ]);
  });
});
