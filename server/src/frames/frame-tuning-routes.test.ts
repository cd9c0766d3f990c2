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
import { createFileStore } from '../files/file-store';
import { measureLevels } from '../inversion-pool/invert-negative-file';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { workingNegativeCacheOf } from '../tuning/working-negative-cache';
import { frameNegative } from './frame-negative';

let t: TestApp;
let operator: Client;
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

// the test negatives have a rebate of unexposed film along the top 4 rows (synth-command's 6 %, at least 4 px)
const rebate = { x: 8, y: 0, width: 20, height: 3 };

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

describe('film base by hand', () => {
  it('refuses a rectangle past the edge of the scan, naming the field', async () => {
    const res = await operator.send('put', `/api/frames/${frames[0]}/base`, {
      mode: 'region',
      region: { x: 90, y: 0, width: 10, height: 3 },
    });
    expect(res.status).toBe(422);
    expect(res.body.errors).toEqual([
      { path: 'body.region.width', message: "x + width is 100, past the scan's width of 96 pixels" },
    ]);
  });

  it('samples a frame’s base in a drawn rectangle, and goes back to automatic', async () => {
    const drawn = await operator.send('put', `/api/frames/${frames[0]}/base`, {
      mode: 'region',
      region: rebate,
    });
    expect(drawn.status).toBe(200);
    expect(drawn.body.base).toMatchObject({ mode: 'region', region: rebate });
    expect(drawn.body.base.measured.confidence).toBeGreaterThan(0);
    const auto = await operator.send('put', `/api/frames/${frames[0]}/base`, { mode: 'auto' });
    expect(auto.body.base).toMatchObject({ mode: 'auto', region: null });
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('action', '=', 'frame-base-changed')
      .execute();
    expect(audit).toHaveLength(2);
  });
});
