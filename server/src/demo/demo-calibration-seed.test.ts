import { createHash } from 'node:crypto';
import sharp from 'sharp';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listCalibrationRollsOnFile } from '../calibrations/calibration-rolls-on-file';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import {
  demoBracketStops,
  demoCalibrationRoll,
  demoCalibrationSeedStep,
  demoCalibrationFilm,
  demoCalibrationStockName,
} from './demo-calibration-seed';
import { demoCalibrationLayout } from './demo-calibration-layout';
import { catalogueSeedStep } from './demo-catalogue-seed';
import { seedDemo } from './seed';

let t: TestApp;
let operator: Client;
let customer: Client;
let seedSeconds: number;

/** Collects a binary answer into a Buffer (supertest parses only text and JSON by itself). */
const binary = (res: Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
};

beforeAll(async () => {
  t = await createTestApp();
  const started = performance.now();
  await seedDemo(t.db, { clock: t.clock }, [catalogueSeedStep, demoCalibrationSeedStep]);
  seedSeconds = (performance.now() - started) / 1000;
  await addUser(t.db, 'operator', 'olwen@lab.test');
  await addUser(t.db, 'customer', 'corin@lab.test');
  operator = await signedIn(t.app, 'olwen@lab.test');
  customer = await signedIn(t.app, 'corin@lab.test');
}, 120_000);
afterAll(() => t.close());

describe('demo calibration roll', () => {
  it('puts a roll on file for a demo stock with no calibration yet: the bracket with its stops, a chart and a leader', async () => {
    const stock = await t.db
      .selectFrom('stocks')
      .selectAll()
      .where('name', '=', demoCalibrationStockName)
      .executeTakeFirstOrThrow();
    expect(stock.masked).toBe(0);
    expect(await t.db.selectFrom('calibrations').select('id').execute()).toEqual([]);

    const res = await operator.get('/api/calibration-rolls');
    expect(res.status, res.text).toBe(200);
    expect(res.body.rolls).toHaveLength(1);
    const roll = res.body.rolls[0];
    expect(roll).toMatchObject({ stockId: stock.id, stockName: demoCalibrationStockName, scannerId: null });
    const frames = roll.frames as {
      n: number;
      role: string;
      stops: number | null;
      width: number;
      height: number;
    }[];
    expect(frames.map((f) => f.n)).toEqual(frames.map((_, i) => i + 1));
    expect(frames.filter((f) => f.role === 'bracket').map((f) => f.stops)).toEqual([...demoBracketStops]);
    expect(frames.slice(-2).map((f) => f.role)).toEqual(['chart', 'leader']);
    expect(frames.every((f) => f.height === 400 && f.width <= 600)).toBe(true);
    // small frames generate in a moment: the measured time is printed for the report
    console.info(`demo calibration roll seeded in ${seedSeconds.toFixed(2)} s`);
    expect(seedSeconds).toBeLessThan(60);
  });

  it('serves each frame as the stored 16-bit scan, and to staff only', async () => {
    const [roll] = await listCalibrationRollsOnFile(t.db);
    const chart = roll!.frames.find((f) => f.role === 'chart')!;
    const res = await operator
      .get(`/api/calibration-rolls/${roll!.id}/frames/${chart.n}`)
      .buffer(true)
      .parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/tiff');
    const file = await t.db
      .selectFrom('files')
      .selectAll()
      .where('id', '=', chart.fileId)
      .executeTakeFirstOrThrow();
    expect(
      createHash('sha256')
        .update(res.body as Buffer)
        .digest('hex'),
    ).toBe(file.sha256);
    const meta = await sharp(res.body as Buffer).metadata();
    expect([meta.width, meta.height, meta.depth]).toEqual([chart.width, chart.height, 'ushort']);

    expect((await customer.get(`/api/calibration-rolls/${roll!.id}/frames/1`)).status).toBe(403);
    const missing = await operator.get(`/api/calibration-rolls/${roll!.id}/frames/99`);
    expect(missing.status).toBe(404);
    expect(missing.headers['content-type']).toMatch(/^application\/problem\+json/);
  });

  it('fits, marked by its known layout, into a new draft of the stock’s profile with the batch’s γ', async () => {
    const [roll] = await listCalibrationRollsOnFile(t.db);
    const made = demoCalibrationRoll();
    // the layout browser tests click by is where the generated roll's marks are
    expect(demoCalibrationLayout).toEqual({
      greyRegion: made.greyRegion,
      chartCorners: made.chartCorners,
      chart: { width: made.chart.width, height: made.chart.height },
      grey: { width: made.brackets[0]!.negative.width, height: made.brackets[0]!.negative.height },
    });
    const layout = demoCalibrationLayout;
    const [x, y, width, height] = layout.greyRegion;
    let req = operator.send('post', '/api/calibrations').field(
      'calibration',
      JSON.stringify({
        stockId: roll!.stockId,
        bracket: roll!.frames.filter((f) => f.role === 'bracket').map((f) => ({ stops: f.stops })),
        greyRegion: { x, y, width, height },
        chartCorners: layout.chartCorners,
      }),
    );
    for (const f of roll!.frames) {
      const file = await t.db
        .selectFrom('files')
        .select('sha256')
        .where('id', '=', f.fileId)
        .executeTakeFirstOrThrow();
      const { readFile } = await import('node:fs/promises');
      const { createFileStore } = await import('../files/file-store');
      const bytes = await readFile(createFileStore(t.config.dataDir).pathOf(file.sha256));
      req = req.attach(f.role, bytes, f.fileName);
    }
    const res = await req;
    expect(res.status, res.text).toBe(201);
    // γ of the forward model's batch within 3 %, as the library's own check asks
    (res.body.fit.gamma as number[]).forEach((g, c) =>
      expect(Math.abs(g / demoCalibrationFilm.gamma[c]! - 1)).toBeLessThan(0.03),
    );
    expect(res.body.fit.deltaE.patches).toHaveLength(24);
    expect(res.body.profileVersionId).toBeGreaterThan(0);
    // the draft is a new version of the stock's house profile
    const house = await t.db
      .selectFrom('profiles')
      .select('id')
      .where('stock_id', '=', roll!.stockId)
      .executeTakeFirstOrThrow();
    expect(res.body.profileId).toBe(house.id);
    // the bracket stops at three under, above the speed point's density: the report has a warning to show
    expect((res.body.warnings as { code: string }[]).map((w) => w.code)).toContain(
      'speed-point-extrapolated',
    );
  }, 120_000);

  it('adds nothing when the step runs again', async () => {
    const files = await t.db.selectFrom('files').select('id').execute();
    await demoCalibrationSeedStep.run(t.db, { clock: t.clock });
    expect(await listCalibrationRollsOnFile(t.db)).toHaveLength(1);
    expect(await t.db.selectFrom('files').select('id').execute()).toEqual(files);
  });
});
