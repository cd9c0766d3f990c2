import { neutralAdjustments, type OrderStatus, type OutputFormat } from '@clearbase/contracts';
import {
  CHART_REFERENCE,
  LINEAR_SCANNER,
  TINTLINE_400,
  chartScene,
  exposeNegative,
  gradientScene,
  greySteps,
  outdoorScene,
  type Scene,
} from '@clearbase/inversion';
import { sql, type Kysely } from 'kysely';
import { dirname } from 'node:path';
import sharp from 'sharp';
import type { Database } from '../db/database';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import { insertFrame } from '../frames/frame-repository';
import { measureNegativeBase } from '../film-base/measure-film-base';
import { insertJob, rollTarget } from '../jobs/job-repository';
import { insertOrder } from '../orders/order-repository';
import { readPriceList } from '../prices/price-list-store';
import { currentPublishedVersion, insertRoll } from '../rolls/roll-repository';
import type { SeedStep } from './seed-step';

/** Size of the demo negatives: small, so seeding and the first inversion take a moment only (our choice). */
const demoWidth = 480;
const demoHeight = 320;
// rebate strips of about 6 % of the height above and below, as on 35 mm film (invented, as synth-command's)
const demoRebate = 20;

/** Invented scenes of the demo roll, each framed to fit inside the rebate strips. */
function demoScenes(): { name: string; scene: Scene; exposureStops: number }[] {
  const h = demoHeight - 2 * demoRebate;
  const chart = chartScene(
    CHART_REFERENCE.map((p) => ({ name: p.name, labD50: p.labD50 })),
    Math.floor(Math.min(demoWidth / 6, h / 4)),
  ).scene;
  return [
    { name: 'chart.tif', scene: chart, exposureStops: 0 },
    // 11 steps from 3 % to 90 % reflectance: black card to white card, invented demo values
    { name: 'grey-steps.tif', scene: greySteps(11, 0.03, 0.9, Math.floor(demoWidth / 11)), exposureStops: 0 },
    { name: 'gradient.tif', scene: gradientScene(demoWidth, h, 0.01, 1), exposureStops: 0.5 },
    { name: 'harbour-wall.tif', scene: outdoorScene(demoWidth, h), exposureStops: -0.5 },
  ];
}

/** The data folder is the one holding the database file; the file store lives beside it. */
async function dataDirOf(db: Kysely<Database>): Promise<string> {
  const { rows } = await sql<{ name: string; file: string }>`pragma database_list`.execute(db);
  const file = rows.find((r) => r.name === 'main')?.file;
  if (!file) throw new Error('The demo orders need a database in a file, beside the file store.');
  return dirname(file);
}

/** Demo orders of the demo customer, in several states. */
const demoOrders: { status: OrderStatus; notes: string; formats: OutputFormat[] }[] = [
  { status: 'received', notes: 'Two rolls from a walking holiday, please scan large.', formats: ['jpeg'] },
  { status: 'developing', notes: '', formats: ['jpeg', 'tiff16'] },
  { status: 'tuning', notes: 'Test roll of the new tinted stock.', formats: ['jpeg', 'tiff16'] },
  { status: 'delivered', notes: 'Family portraits.', formats: ['jpeg'] },
];

/**
 * Demo orders for the demo customer in several states; the one being tuned has a roll of negatives made by the
 * forward model (a colour chart, grey steps, a gradient, an outdoor scene) uploaded and queued for inversion, so
 * the queue inverts it as soon as the server starts.
 */
export const demoOrdersSeedStep: SeedStep = {
  name: 'orders',
  async run(db, { clock }) {
    const at = clock.now();
    const customer = await db
      .selectFrom('users')
      .select('id')
      .where('email', '=', 'customer@clearbase.test')
      .executeTakeFirst();
    const stock = await db
      .selectFrom('stocks')
      .select('id')
      .where('name', '=', 'Glasswing 400')
      .executeTakeFirst();
    if (!customer || !stock) return;
    const version = await currentPublishedVersion(db, stock.id, null);
    if (!version) return;
    const store = createFileStore(await dataDirOf(db));

    for (const demo of demoOrders) {
      const order = await insertOrder(db, {
        customerId: customer.id,
        notes: demo.notes,
        outputFormats: demo.formats,
        scanSize: 'standard',
        at,
        priceList: await readPriceList(db),
      });
      await db.updateTable('orders').set({ status: demo.status }).where('id', '=', order.id).execute();
      if (demo.status !== 'tuning') continue;

      const roll = await insertRoll(db, {
        orderId: order.id,
        stockId: stock.id,
        ei: 400,
        pushPull: 0,
        format: '135-36',
        scannerId: null,
        profileVersionId: version.id,
        adjustments: neutralAdjustments,
        at,
      });
      for (const [i, frame] of demoScenes().entries()) {
        const negative = exposeNegative(frame.scene, {
          stock: TINTLINE_400,
          scanner: LINEAR_SCANNER,
          exposureStops: frame.exposureStops,
          // light grain and a speck of dust, as on a real scan (invented demo values)
          grain: 0.004,
          seed: i + 1,
          rebate: demoRebate,
          sprocketHoles: true,
          dust: 2,
        });
        const tiff = await sharp(negative.data, {
          raw: { width: negative.width, height: negative.height, channels: 3 },
        })
          .toColourspace('rgb16')
          .tiff({ compression: 'deflate', predictor: 'horizontal' })
          .toBuffer();
        const stored = await store.putBytes(tiff);
        const file = await recordFile(db, {
          sha256: stored.sha256,
          size: stored.size,
          mediaType: 'image/tiff',
          at,
        });
        const row = await insertFrame(db, {
          rollId: roll.id,
          index: i + 1,
          sourceFileId: file.id,
          fileName: frame.name,
          width: negative.width,
          height: negative.height,
          bitDepth: 16,
          warnings: [],
          adjustments: neutralAdjustments,
          at,
        });
        const base = measureNegativeBase(negative, LINEAR_SCANNER, null);
        await db
          .updateTable('frames')
          .set({ base_measured: JSON.stringify(base) })
          .where('id', '=', row.id)
          .execute();
      }
      await db.updateTable('rolls').set({ status: 'inverting' }).where('id', '=', roll.id).execute();
      await insertJob(db, {
        kind: 'invert-roll',
        target: rollTarget(roll.id),
        payload: { rollId: roll.id, frames: 'pending' },
        total: 4,
        by: null,
        at,
      });
    }
  },
};
