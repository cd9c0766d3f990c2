import {
  calibrationRoll,
  CHART_REFERENCE,
  chartGridFromCorners,
  detectFilmBase,
  fitCalibration,
  LINEAR_SCANNER,
  rollBase,
  sampleRegion,
  TINTLINE_400,
  type FilmStock,
  type Region,
} from '@clearbase/inversion';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import sharp from 'sharp';
import request_ from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertStock } from '../stocks/stock-repository';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { writeCalibrationReport } from './calibration-report-pdf';
import { describeFit, residualsOf } from './describe-fit';
import { GREY_SAMPLE_PIXELS } from './fit-calibration-roll';

// An invented stock whose curves bend inside the bracket, with a tinted base and crosstalk.
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Route test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};

const at = new Date('2026-03-01T08:00:00Z');
let t: TestApp;
let operator: Client;
let customer: Client;
let stockId: number;
let roll: ReturnType<typeof calibrationRoll>;
let greyFiles: Buffer[];
let chartFile: Buffer;

// sharp's TIFF default is JPEG compression, which is 8-bit: deflate keeps the 16 bits
const tiff = (data: Uint16Array, width: number, height: number) =>
  sharp(data, { raw: { width, height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toBuffer();
const region = ([x, y, width, height]: readonly number[]) => ({
  x: x!,
  y: y!,
  width: width!,
  height: height!,
});

function request(overrides: Record<string, unknown> = {}) {
  return JSON.stringify({
    stockId,
    bracket: roll.brackets.map((b) => ({ stops: b.stops })),
    greyRegion: region(roll.greyRegion),
    chartCorners: roll.chartCorners,
    ...overrides,
  });
}

function submit(c: Client, json: string, files = greyFiles) {
  let req = c.send('post', '/api/calibrations').field('calibration', json);
  files.forEach((f, i) => (req = req.attach('bracket', f, `grey-${String(i + 1).padStart(2, '0')}.tif`)));
  return req.attach('chart', chartFile, 'chart.tif');
}

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'operator', 'olga@lab.test');
  await addUser(t.db, 'customer', 'cyrus@lab.test');
  operator = await signedIn(t.app, 'olga@lab.test');
  customer = await signedIn(t.app, 'cyrus@lab.test');
  stockId = (
    await insertStock(
      t.db,
      {
        name: 'Route test 400',
        maker: 'Test Emulsions',
        iso: 400,
        process: 'C-41',
        masked: false,
        baseMaterial: 'tinted polyester',
        frameFormats: ['135-36'],
        notes: '',
      },
      at,
    )
  ).id;
  roll = calibrationRoll({
    stock: STOCK,
    scanner: LINEAR_SCANNER,
    stops: Array.from({ length: 15 }, (_, i) => i - 6),
    greySize: 32,
  });
  greyFiles = await Promise.all(
    roll.brackets.map((b) => tiff(b.negative.data, b.negative.width, b.negative.height)),
  );
  chartFile = await tiff(roll.chart.data, roll.chart.width, roll.chart.height);
}, 60_000);
afterAll(() => t.close());

describe('calibrations API', () => {
  let created: { id: number; profileVersionId: number; profileId: number };

  it('fits an uploaded calibration roll, records it and makes a draft version linked both ways', async () => {
    const res = await submit(operator, request());
    expect(res.status, res.text).toBe(201);
    created = res.body;
    const body = res.body;
    // γ of the forward model's stock (0.55, 0.62, 0.70) within 3 %, as the library's own check asks
    body.fit.gamma.forEach((g: number, c: number) =>
      expect(Math.abs(g / STOCK.gamma[c]! - 1)).toBeLessThan(0.03),
    );
    expect(body.fit.deltaE.patches).toHaveLength(24);
    expect(body.fit.deltaE.patches[0].referenceHex).toMatch(/^#[0-9a-f]{6}$/);
    expect(body.fit.deltaE.after.mean).toBeLessThan(1.5);
    expect(body.inputs.frames).toHaveLength(16);
    expect(body.inputs.frames[15]).toMatchObject({ n: 16, role: 'chart', fileName: 'chart.tif' });
    expect(body.inputs.frames[0]).toMatchObject({ n: 1, role: 'bracket', stops: -6, bitDepth: 16 });
    expect(body.profileVersionId).toBeGreaterThan(0);
    expect(body.fit.seconds).toBeLessThan(5);

    const version = await t.db
      .selectFrom('profile_versions')
      .selectAll()
      .where('id', '=', body.profileVersionId)
      .executeTakeFirstOrThrow();
    expect(version.status).toBe('draft');
    expect(version.calibration_id).toBe(body.id);
    const doc = JSON.parse(version.parameters);
    expect(doc.stock).toMatchObject({ name: 'Route test 400', iso: 400, base: 'tinted' });
    const byVersion = await operator
      .get(`/api/calibrations?profileVersionId=${body.profileVersionId}`)
      .expect(200);
    expect(byVersion.body.calibrations.map((c: { id: number }) => c.id)).toEqual([body.id]);
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('target', '=', `calibration:${body.id}`)
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['calibration-created']);
    expect(readdirSync(join(t.config.dataDir, 'tmp'))).toEqual([]);
  }, 30_000);

  it('adds a second calibration of the same stock as a new draft of the same profile', async () => {
    const res = await submit(operator, request()).expect(201);
    expect(res.body.profileId).toBe(created.profileId);
    expect(res.body.profileVersionId).not.toBe(created.profileVersionId);
    const version = await operator.get(`/api/profile-versions/${res.body.profileVersionId}`).expect(200);
    expect(version.body.version).toMatchObject({ version: 2, parentVersionId: created.profileVersionId });
  }, 30_000);

  it('lists calibrations newest first and answers one with its inputs', async () => {
    const list = await operator.get('/api/calibrations').expect(200);
    expect(list.body.calibrations.length).toBeGreaterThanOrEqual(2);
    expect(list.body.calibrations[0].id).toBeGreaterThan(list.body.calibrations[1].id);
    expect(list.body.calibrations[0]).toMatchObject({
      stockName: 'Route test 400',
      createdByName: 'Test operator',
    });
    const one = await operator.get(`/api/calibrations/${created.id}`).expect(200);
    expect(one.body.inputs.chartCorners).toEqual(roll.chartCorners);
    await operator.get('/api/calibrations/9999').expect(404);
  });

  it('streams the report as a four-page PDF', async () => {
    const res = await operator
      .get(`/api/calibrations/${created.id}/report.pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(pdf.toString('latin1').match(/\/Type \/Page\b/g)).toHaveLength(4);
  });

  it('writes the fitted values, the patch table and the warnings into the report', async () => {
    const one = (await operator.get(`/api/calibrations/${created.id}`).expect(200)).body;
    const chunks: Buffer[] = [];
    const sink = new Writable({
      write(chunk: Buffer, _e, done) {
        chunks.push(chunk);
        done();
      },
    });
    await writeCalibrationReport(one, sink, { compress: false });
    // pdfkit writes standard-font text as hex strings: decode them to read the pages
    const text = [
      ...Buffer.concat(chunks)
        .toString('latin1')
        .matchAll(/<([0-9a-f]+)>/g),
    ]
      .map((m) => Buffer.from(m[1]!, 'hex').toString('latin1'))
      .join('');
    expect(text).toContain(`Calibration ${one.id}: Route test 400`);
    expect(text).toContain(`EI ${Math.round(one.fit.ei)}`);
    expect(text).toContain('Largest spread');
    expect(text).toContain('dark skin');
    expect(text).toContain(one.warnings.length ? one.warnings[0].message.slice(0, 20) : 'None.');
    expect(text).toContain(one.fit.curves.green.gamma.toFixed(3));
    expect(text).toContain(
      `Cross-validated (each patch by a fit without it): mean ${one.fit.deltaE.crossValidated.mean.toFixed(2)}`,
    );
    expect(text).toContain('Chart patches in the a*b* plane');
  });

  it('previews an uploaded frame as a JPEG with the frame’s full size in headers', async () => {
    const res = await operator.get(`/api/calibrations/${created.id}/frames/16/preview`).expect(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    expect(res.headers['x-frame-width']).toBe(String(roll.chart.width));
    await operator.get(`/api/calibrations/${created.id}/frames/17/preview`).expect(404);
    const before = await operator
      .send('post', '/api/calibrations/frame-preview')
      .attach('file', chartFile, 'chart.tif')
      .expect(200);
    expect(before.headers['x-frame-height']).toBe(String(roll.chart.height));
    const meta = await sharp(before.body as Buffer).metadata();
    expect(meta.format).toBe('jpeg');
  });

  it('answers 403 to customers', async () => {
    await customer.get('/api/calibrations').expect(403);
    await submit(customer, request()).expect(403);
  });

  it('answers 422 with the path of a bad bracket entry and keeps nothing', async () => {
    const files = await t.db.selectFrom('files').select('id').execute();
    const bracket = roll.brackets.map((b, i) => ({ stops: i === 3 ? 'minus one' : b.stops }));
    const res = await submit(operator, request({ bracket })).expect(422);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.errors).toEqual([
      { path: 'bracket[3].stops', message: expect.stringContaining('stops') },
    ]);

    const wide = await submit(
      operator,
      request({ greyRegion: { x: 20, y: 20, width: 40, height: 4 } }),
    ).expect(422);
    expect(wide.body.errors[0]).toMatchObject({ path: 'greyRegion.width' });

    const broken = [...greyFiles];
    broken[2] = Buffer.from('not a scan');
    const unreadable = await submit(operator, request(), broken).expect(422);
    expect(unreadable.body.errors).toEqual([
      { path: 'bracket[2]', message: expect.stringContaining('grey-03.tif: The file is not an image') },
    ]);

    const fewer = await submit(operator, request(), greyFiles.slice(0, 10)).expect(422);
    expect(fewer.body.errors[0].path).toBe('bracket');
    expect(await t.db.selectFrom('files').select('id').execute()).toHaveLength(files.length);
    expect(readdirSync(join(t.config.dataDir, 'tmp'))).toEqual([]);
  }, 30_000);

  it('fits on the worker thread exactly the values the library computes in process', async () => {
    const res = await submit(operator, request()).expect(201);
    // the same measurements taken on the main thread, as the route did before it used a worker
    const samples = roll.brackets.map((b) => ({
      stops: b.stops,
      sample: sampleRegion(b.negative, LINEAR_SCANNER, roll.greyRegion, { maxSamples: GREY_SAMPLE_PIXELS }),
    }));
    const grid = chartGridFromCorners(roll.chartCorners);
    const chart = grid.patches.map((p) => sampleRegion(roll.chart, LINEAR_SCANNER, p.sample));
    const base = rollBase(
      [...roll.brackets.map((b) => b.negative), roll.chart].map((n) => detectFilmBase(n, LINEAR_SCANNER)),
    );
    const result = fitCalibration({
      base: base.rgb,
      brackets: samples,
      chart,
      stock: { name: 'Route test 400', iso: 400, base: 'tinted' },
      reference: CHART_REFERENCE,
    });
    const { seconds: _s, ...expected } = describeFit(result, samples, base.rgb, 'frames', 400, 0);
    const { seconds: _t, ...actual } = res.body.fit;
    expect(actual).toEqual(expected);
    expect(res.body.residuals).toEqual(residualsOf(result));
    const version = await operator.get(`/api/profile-versions/${res.body.profileVersionId}`).expect(200);
    expect(version.body.version.parameters.curves).toEqual(result.profileDocument.curves);
  }, 30_000);

  it('keeps the server answering while a calibration is measured and fitted', async () => {
    // the roll scaled up 24 times (nearest neighbour, the same counts), so the frames take a while to measure
    const scale = 24;
    const big = (data: Uint16Array, width: number, height: number) =>
      sharp(data, { raw: { width, height, channels: 3 } })
        .resize(width * scale, height * scale, { kernel: 'nearest' })
        .toColourspace('rgb16')
        .tiff({ compression: 'deflate', predictor: 'horizontal' })
        .toBuffer();
    const grey = await Promise.all(
      roll.brackets.map((b) => big(b.negative.data, b.negative.width, b.negative.height)),
    );
    const chartBig = await big(roll.chart.data, roll.chart.width, roll.chart.height);
    const json = request({
      greyRegion: region(roll.greyRegion.map((v) => v * scale) as Region),
      chartCorners: roll.chartCorners.map(([x, y]) => [x * scale, y * scale]),
    });
    let finished = 0;
    let req = operator.send('post', '/api/calibrations').field('calibration', json);
    grey.forEach((f, i) => (req = req.attach('bracket', f, `grey-${i + 1}.tif`)));
    const fitting = req.attach('chart', chartBig, 'chart.tif').then((res) => {
      finished = performance.now();
      return res;
    });
    await new Promise((r) => setTimeout(r, 300));
    let answers = 0;
    let answered = 0;
    while (!finished && answers < 50) {
      await request_(t.app).get('/api/health').expect(200);
      answered = performance.now();
      answers++;
      await new Promise((r) => setTimeout(r, 20));
    }
    const res = await fitting;
    expect(res.status, res.text).toBe(201);
    // health was answered again and again while the calibration was still running: a fit holding the event loop
    // would have kept even the first answer until it was done (no bound in milliseconds, which load would break)
    expect(answers).toBeGreaterThan(1);
    expect(answered).toBeLessThan(finished);
    res.body.fit.gamma.forEach((g: number, c: number) =>
      expect(Math.abs(g / STOCK.gamma[c]! - 1)).toBeLessThan(0.03),
    );
  }, 60_000);
});
