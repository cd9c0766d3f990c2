import { createCalibrationRequestSchema, type Calibration, type User } from '@clearbase/contracts';
import { calibrationRoll, LINEAR_SCANNER, TINTLINE_400, type FilmStock } from '@clearbase/inversion';
import { createHash } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import { insertStock } from '../stocks/stock-repository';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addCalibrationRollOnFile, type CalibrationFrameOnFile } from './calibration-rolls-on-file';
import type { ReceivedCalibration } from './calibration-upload';
import { createCalibrationsService } from './calibrations-service';

// An invented stock whose curves bend inside the bracket, with a tinted base and crosstalk.
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Service test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};

const at = new Date('2026-03-01T08:00:00Z');
let t: TestApp;
let operator: User;
let stockId: number;
const store = () => createFileStore(t.config.dataDir);
const calibrations = () =>
  createCalibrationsService({
    db: t.db,
    clock: t.clock,
    store: store(),
    maxPixels: t.config.uploads.maxPixels,
  });

beforeAll(async () => {
  t = await createTestApp();
  operator = {
    id: await addUser(t.db, 'operator', 'olga@lab.test'),
    email: 'olga@lab.test',
    name: 'Test operator',
    role: 'operator',
  };
  stockId = (
    await insertStock(
      t.db,
      {
        name: 'Service test 400',
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
});
afterAll(() => t.close());

/** A stored file of the given bytes, recorded in the database. */
async function storedFile(bytes: string) {
  const stored = await store().putBytes(Buffer.from(bytes));
  return recordFile(t.db, { sha256: stored.sha256, size: stored.size, mediaType: 'image/tiff', at });
}

const frameOnFile = (n: number, fileId: number): CalibrationFrameOnFile => ({
  n,
  role: 'bracket',
  fileId,
  fileName: `grey-${n}.tif`,
  width: 32,
  height: 32,
  stops: n - 1,
});

describe('looking up a calibration', () => {
  it('answers 404 for a calibration that does not exist', async () => {
    await expect(calibrations().load(999)).rejects.toMatchObject({
      status: 404,
      code: 'calibration-not-found',
      message: 'No calibration with id 999.',
    });
  });

  it("answers 404 for a frame of a calibration that does not exist, naming the calibration's id", async () => {
    await expect(calibrations().frameFile(999, 1)).rejects.toMatchObject({
      status: 404,
      code: 'calibration-not-found',
      message: 'No calibration with id 999.',
    });
  });
});

describe('calibration rolls on file', () => {
  let rollId: number;
  let firstFileId: number;

  beforeAll(async () => {
    firstFileId = (await storedFile('grey frame 1')).id;
    const second = await storedFile('grey frame 2');
    const common = { scannerId: null, note: '', createdAt: at.toISOString() };
    rollId = (
      await addCalibrationRollOnFile(t.db, {
        ...common,
        stockId,
        title: 'Trial roll, bench 1',
        frames: [frameOnFile(1, firstFileId), frameOnFile(2, second.id), frameOnFile(3, 99_999)],
      })
    ).id;
    // a stock id no stock has (any more): its roll cannot be fitted
    await addCalibrationRollOnFile(t.db, {
      ...common,
      stockId: 99_998,
      title: 'Roll of a removed stock',
      frames: [frameOnFile(1, firstFileId)],
    });
  });

  it('leaves out rolls whose stock is gone, and names the stock of the others', async () => {
    const rolls = await calibrations().rollsOnFile();
    expect(rolls.map((r) => [r.id, r.title, r.stockName])).toEqual([
      [rollId, 'Trial roll, bench 1', 'Service test 400'],
    ]);
  });

  it("hands out a frame's stored file with its name", async () => {
    const frame = await calibrations().rollFrame(rollId, 1);
    expect(frame.fileName).toBe('grey-1.tif');
    expect(frame.file.id).toBe(firstFileId);
  });

  it('answers 404 for a roll not on file', async () => {
    await expect(calibrations().rollFrame(999, 1)).rejects.toMatchObject({
      status: 404,
      code: 'calibration-roll-not-found',
      message: 'No calibration roll on file with id 999.',
    });
  });

  it('answers 404 for a frame the roll does not have, or whose file is gone, naming the frames it has', async () => {
    for (const n of [7, 3]) {
      await expect(calibrations().rollFrame(rollId, n)).rejects.toMatchObject({
        status: 404,
        code: 'calibration-frame-not-found',
        message: `Calibration roll ${rollId} has frames 1 to 3, not ${n}.`,
      });
    }
  });
});

// sharp's TIFF default is JPEG compression, which is 8-bit: deflate keeps the 16 bits
const tiff = (data: Uint16Array, width: number, height: number) =>
  sharp(data, { raw: { width, height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toBuffer();

/** A calibration roll of the invented stock as the upload hands it over: its request and its frames in the store's temp folder. */
async function receivedRoll(): Promise<ReceivedCalibration> {
  const roll = calibrationRoll({
    stock: STOCK,
    scanner: LINEAR_SCANNER,
    stops: Array.from({ length: 15 }, (_, i) => i - 6),
    greySize: 32,
  });
  const files = [
    ...roll.brackets.map((b, i) => ({
      role: 'bracket' as const,
      index: i,
      fileName: `grey-${String(i + 1).padStart(2, '0')}.tif`,
      image: b.negative,
    })),
    { role: 'chart' as const, index: 0, fileName: 'chart.tif', image: roll.chart },
  ];
  const uploads = await Promise.all(
    files.map(async ({ image, ...upload }) => {
      const bytes = await tiff(image.data, image.width, image.height);
      const path = store().tempPath();
      await writeFile(path, bytes);
      const sha256 = createHash('sha256').update(bytes).digest('hex');
      return { ...upload, path, file: { path, size: bytes.length, sha256, tooLarge: false } };
    }),
  );
  const [x, y, width, height] = roll.greyRegion;
  const request = createCalibrationRequestSchema.parse({
    stockId,
    bracket: roll.brackets.map((b) => ({ stops: b.stops })),
    greyRegion: { x, y, width, height },
    chartCorners: roll.chartCorners,
  });
  return { request, uploads };
}

describe('creating a calibration', () => {
  let received: ReceivedCalibration;
  let made: Calibration;

  beforeAll(async () => {
    received = await receivedRoll();
    // the one fit of this file: every test below reads what it made
    made = await calibrations().create(operator, received);
  }, 120_000);

  it('files a draft version through the profiles service, linked both ways, and audits it by name', async () => {
    expect(made.profileVersionId).toBeGreaterThan(0);
    const version = await t.db
      .selectFrom('profile_versions')
      .innerJoin('profiles', 'profiles.id', 'profile_versions.profile_id')
      .select([
        'profile_versions.status',
        'profile_versions.calibration_id',
        'profiles.id',
        'profiles.stock_id',
      ])
      .where('profile_versions.id', '=', made.profileVersionId!)
      .executeTakeFirstOrThrow();
    expect(version).toEqual({
      status: 'draft',
      calibration_id: made.id,
      id: made.profileId,
      stock_id: stockId,
    });
    const audit = await t.db
      .selectFrom('audit_log')
      .select(['action', 'details'])
      .where('target', '=', `calibration:${made.id}`)
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['calibration-created']);
    expect(JSON.parse(audit[0]!.details!)).toMatchObject({
      stockId,
      profileId: made.profileId,
      profileVersionId: made.profileVersionId,
      created: 'profile',
    });
    expect(await calibrations().load(made.id)).toEqual(made);
  });

  it('answers the cross-validated ΔE00, the neutral row, the chart frame and the exposure matrix', async () => {
    const e = made.fit.deltaE;
    expect(e.crossValidated!.mean).toBeGreaterThan(0);
    // a patch predicted by a fit that never saw it is no closer than the patches the fit saw
    expect(e.crossValidated!.mean!).toBeGreaterThanOrEqual(e.after.mean! - 1e-9);
    expect(e.crossValidated!.max!).toBeGreaterThanOrEqual(e.crossValidated!.mean!);
    const counted = e.patches.filter((p) => p.inGamut && p.measured && p.deltaECrossValidated !== null);
    expect(counted.length).toBeGreaterThan(12);
    const mean = counted.reduce((sum, p) => sum + p.deltaECrossValidated!, 0) / counted.length;
    expect(mean).toBeCloseTo(e.crossValidated!.mean!, 5);
    counted.forEach((p) => expect(p.crossValidated).toHaveLength(3));
    expect(e.neutral!.a).toBeGreaterThanOrEqual(0);
    expect(e.neutral!.b).toBeGreaterThanOrEqual(0);
    expect(e.frames).toHaveLength(1);
    expect(e.frames[0]!.patchesUsed).toBeGreaterThan(12);
    expect(e.frames[0]!.after.mean).toBeCloseTo(e.after.mean!, 5);
    made.fit.exposureMatrix!.forEach((row) => expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 5));
    expect(e.memorisedChart).toBe(made.warnings.some((w) => w.code === 'memorised-chart'));
  });

  it('still reads a calibration stored before the cross-validated figures were kept', async () => {
    const row = await t.db
      .selectFrom('calibrations')
      .select('fitted')
      .where('id', '=', made.id)
      .executeTakeFirstOrThrow();
    const older = JSON.parse(row.fitted) as Record<string, unknown> & { deltaE: Record<string, unknown> };
    delete older['exposureMatrix'];
    for (const key of ['crossValidated', 'neutral', 'frames', 'memorisedChart']) delete older.deltaE[key];
    older.deltaE['patches'] = (older.deltaE['patches'] as Record<string, unknown>[]).map(
      ({ crossValidated: _c, deltaECrossValidated: _d, ...p }) => p,
    );
    await t.db
      .updateTable('calibrations')
      .set({ fitted: JSON.stringify(older) })
      .where('id', '=', made.id)
      .execute();
    try {
      const loaded = await calibrations().load(made.id);
      expect(loaded.fit.exposureMatrix).toBeNull();
      expect(loaded.fit.deltaE).toMatchObject({
        crossValidated: null,
        neutral: null,
        frames: [],
        memorisedChart: false,
      });
      expect(
        loaded.fit.deltaE.patches.every((p) => p.crossValidated === null && p.deltaECrossValidated === null),
      ).toBe(true);
      expect(loaded.fit.deltaE.after).toEqual(made.fit.deltaE.after);
    } finally {
      await t.db.updateTable('calibrations').set({ fitted: row.fitted }).where('id', '=', made.id).execute();
    }
  });

  it('keeps each frame in the store, found by its number, and names the frames it has for any other', async () => {
    const chart = received.uploads.at(-1)!;
    const file = await calibrations().frameFile(made.id, 16);
    expect(file.sha256).toBe(chart.file.sha256);
    await expect(calibrations().frameFile(made.id, 17)).rejects.toMatchObject({
      status: 404,
      code: 'calibration-frame-not-found',
      message: `Calibration ${made.id} has frames 1 to 16, not 17.`,
    });
  });
});
