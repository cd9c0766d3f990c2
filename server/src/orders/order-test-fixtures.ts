import { POLYCLEAR_200, profileForStock } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import sharp from 'sharp';
import { demoNegative } from '../cli/synth-command';
import type { Database } from '../db/database';
import { insertDraft, insertProfile } from '../profiles/profile-repository';
import { insertStock } from '../stocks/stock-repository';
import { addUser, signedIn, type Client, type TestApp } from '../test-support/test-app';

const at = new Date('2026-03-01T08:00:00Z');

/** A stock with a published profile (from the forward model's invented stock) and one with only a draft. */
export async function addTestCatalogue(
  db: Kysely<Database>,
): Promise<{ stockId: number; versionId: number; unpublishedStockId: number }> {
  const stock = await insertStock(
    db,
    {
      name: 'Testline 200',
      maker: 'Test Emulsions',
      iso: 200,
      process: 'C-41',
      masked: false,
      baseMaterial: 'clear polyester',
      frameFormats: ['135-36'],
      notes: '',
    },
    at,
  );
  const profile = await insertProfile(db, {
    stockId: stock.id,
    scannerId: null,
    name: 'Testline house profile',
    documentId: 'testline',
    at,
    by: null,
  });
  const version = await insertDraft(db, {
    profile,
    parentVersionId: null,
    parameters: profileForStock(POLYCLEAR_200),
    at,
    by: null,
  });
  await db
    .updateTable('profile_versions')
    .set({ status: 'published', changelog: 'first', published_at: at.toISOString() })
    .where('id', '=', version.id)
    .execute();
  const other = await insertStock(
    db,
    {
      name: 'Draftline 400',
      maker: 'Test Emulsions',
      iso: 400,
      process: 'C-41',
      masked: false,
      baseMaterial: 'clear polyester',
      frameFormats: ['135-36'],
      notes: '',
    },
    at,
  );
  const draftOnly = await insertProfile(db, {
    stockId: other.id,
    scannerId: null,
    name: 'Draftline trial',
    documentId: 'draftline',
    at,
    by: null,
  });
  await insertDraft(db, {
    profile: draftOnly,
    parentVersionId: null,
    parameters: profileForStock(POLYCLEAR_200),
    at,
    by: null,
  });
  return { stockId: stock.id, versionId: version.id, unpublishedStockId: other.id };
}

/** A small 16-bit TIFF negative of the forward model's outdoor scene, with rebate and sprocket holes. */
export async function negativeTiff(
  options: { width?: number; height?: number; seed?: number; exposureStops?: number } = {},
): Promise<Buffer> {
  const neg = demoNegative({
    width: options.width ?? 96,
    height: options.height ?? 64,
    stock: POLYCLEAR_200,
    seed: options.seed ?? 1,
    exposureStops: options.exposureStops ?? 0,
  });
  return sharp(neg.data, { raw: { width: neg.width, height: neg.height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toBuffer();
}

/**
 * An order of one roll (135-36 at EI 200) placed by staff for a customer, with the given test negatives uploaded
 * to it; returns the ids, frames in upload order.
 * @example const { roll, frames } = await addRollWithScans(operator, { customerId, stockId, scans: [{ name: 'a.tif', seed: 1 }] });
 */
export async function addRollWithScans(
  staff: Client,
  options: {
    customerId: number;
    stockId: number;
    scans: { name: string; seed: number; exposureStops?: number }[];
    outputFormats?: string[];
  },
): Promise<{ order: number; roll: number; frames: number[] }> {
  const formats = options.outputFormats ? { outputFormats: options.outputFormats } : {};
  const order = (await staff.post('/api/orders', { customerId: options.customerId, ...formats }).expect(201))
    .body.id as number;
  const roll = (
    await staff
      .post(`/api/orders/${order}/rolls`, { stockId: options.stockId, ei: 200, format: '135-36' })
      .expect(201)
  ).body.id as number;
  let upload = staff.send('post', `/api/rolls/${roll}/frames`);
  for (const scan of options.scans) {
    const tiff = await negativeTiff({ seed: scan.seed, exposureStops: scan.exposureStops ?? 0 });
    upload = upload.attach('files', tiff, scan.name);
  }
  const up = await upload.expect(201);
  return { order, roll, frames: (up.body.accepted as { frameId: number }[]).map((a) => a.frameId) };
}

/**
 * The lab an order test works in: a customer (cass@lab.test), an operator (oskar@lab.test) signed in, and the test
 * catalogue of `addTestCatalogue`.
 * @example const { customerId, operator, stockId } = await addOrderTestLab(t);
 */
export async function addOrderTestLab(t: TestApp): Promise<{
  customerId: number;
  operator: Client;
  stockId: number;
  versionId: number;
  unpublishedStockId: number;
}> {
  const customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  const catalogue = await addTestCatalogue(t.db);
  const operator = await signedIn(t.app, 'oskar@lab.test');
  return { customerId, operator, ...catalogue };
}
