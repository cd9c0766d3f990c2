import {
  calibrationRoll,
  LINEAR_SCANNER,
  type FilmStock,
  type SyntheticNegative,
} from '@clearbase/inversion';
import { sql, type Kysely } from 'kysely';
import { dirname } from 'node:path';
import sharp from 'sharp';
import {
  addCalibrationRollOnFile,
  listCalibrationRollsOnFile,
  type CalibrationFrameOnFile,
} from '../calibrations/calibration-rolls-on-file';
import type { Database } from '../db/database';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import { findStockByName } from '../stocks/stock-repository';
import { demoCalibrationFrame } from './demo-calibration-layout';
import type { SeedStep } from './seed-step';

/**
 * The demo stock a new coating batch of which was shot for calibration: one of the demo catalogue's stocks, with a
 * house profile but no calibration yet.
 */
export const demoCalibrationStockName = 'Tealine 200';

/** How the forward model develops the new batch: invented values, a little faster than the stock's box speed. */
export const demoCalibrationFilm: FilmStock = {
  name: demoCalibrationStockName,
  base: 'clear',
  iso: 200,
  gamma: [0.56, 0.6, 0.66],
  toe: [-2.2, -2.15, -2.1],
  maxDensity: [2.3, 2.4, 2.5],
  softness: 0.22,
  fog: [0.1, 0.1, 0.11],
  baseDensity: [0.05, 0.05, 0.06],
  crosstalk: [
    [1.08, -0.06, -0.02],
    [-0.05, 1.1, -0.05],
    [-0.02, -0.1, 1.12],
  ],
};

/** Grey card exposures of the demo roll: whole stops from three under to four over (invented bracket). */
export const demoBracketStops = [-3, -2, -1, 0, 1, 2, 3, 4] as const;
const { width: frameWidth, height: frameHeight, rebate, patchSize } = demoCalibrationFrame;
// light grain, as on a fine-grained stock (invented demo value)
const grain = 0.006;

/**
 * The demo calibration roll made with the forward model: the grey card at each of `demoBracketStops`, the
 * 24-patch chart at the metered exposure and a frame of leader, each between unexposed rebates.
 */
export function demoCalibrationRoll(): ReturnType<typeof calibrationRoll> {
  return calibrationRoll({
    stock: demoCalibrationFilm,
    scanner: LINEAR_SCANNER,
    stops: demoBracketStops,
    greySize: frameWidth,
    greyHeight: frameHeight - 2 * rebate,
    patchSize,
    rebate,
    grain,
    leader: true,
  });
}

/** The data folder is the one holding the database file; the file store lives beside it. */
async function dataDirOf(db: Kysely<Database>): Promise<string> {
  const { rows } = await sql<{ name: string; file: string }>`pragma database_list`.execute(db);
  const file = rows.find((r) => r.name === 'main')?.file;
  if (!file) throw new Error('The demo calibration roll needs a database in a file, beside the file store.');
  return dirname(file);
}

/** A 16-bit TIFF as a scanner writes it (deflate: sharp's default JPEG compression would drop to 8 bits). */
function tiffOf(negative: SyntheticNegative): Promise<Buffer> {
  return sharp(negative.data, { raw: { width: negative.width, height: negative.height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toBuffer();
}

/**
 * A calibration roll on file for a new batch of the demo stock — eight grey frames, the chart, the leader — so an
 * operator finds it on the calibration page ready to mark and fit. Does nothing without the stock or when the stock
 * already has a roll on file; the frames are stored by their bytes' hash, so a second run stores nothing new.
 */
export const demoCalibrationSeedStep: SeedStep = {
  name: 'calibration roll',
  async run(db, { clock }) {
    const stock = await findStockByName(db, demoCalibrationStockName);
    if (!stock) return;
    if ((await listCalibrationRollsOnFile(db)).some((r) => r.stockId === stock.id)) return;
    const at = clock.now();
    const store = createFileStore(await dataDirOf(db));
    const roll = demoCalibrationRoll();
    const negatives: {
      role: CalibrationFrameOnFile['role'];
      name: string;
      stops: number | null;
      n: SyntheticNegative;
    }[] = [
      ...roll.brackets.map((b, i) => ({
        role: 'bracket' as const,
        name: `grey-${String(i + 1).padStart(2, '0')}_${b.stops < 0 ? '' : '+'}${b.stops}.tif`,
        stops: b.stops,
        n: b.negative,
      })),
      { role: 'chart', name: 'chart.tif', stops: null, n: roll.chart },
      { role: 'leader', name: 'leader.tif', stops: null, n: roll.leader! },
    ];
    const frames: CalibrationFrameOnFile[] = [];
    for (const [i, f] of negatives.entries()) {
      const stored = await store.putBytes(await tiffOf(f.n));
      const file = await recordFile(db, {
        sha256: stored.sha256,
        size: stored.size,
        mediaType: 'image/tiff',
        at,
      });
      frames.push({
        n: i + 1,
        role: f.role,
        fileId: file.id,
        fileName: f.name,
        width: f.n.width,
        height: f.n.height,
        stops: f.stops,
      });
    }
    await addCalibrationRollOnFile(db, {
      stockId: stock.id,
      scannerId: null,
      title: 'New batch, calibration roll',
      note: 'A new coating batch. Grey card bracketed in whole stops from −3 to +4, one chart frame at the metered exposure, leader cut from the roll’s start.',
      frames,
      createdAt: at.toISOString(),
    });
  },
};
