import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let owner: Client;
let stranger: Client;
let operator: Client;
let orderId: number;
const frameIds: number[] = [];

/** A rendered frame with a 1200×800 preview and a JPEG output, written straight to the tables. */
async function addRenderedFrame(
  rollId: number,
  index: number,
  decision: 'approved' | 'excluded',
  by: number,
) {
  const store = createFileStore(t.config.dataDir);
  const stored = await store.putBytes(
    await sharp({ create: { width: 1200, height: 800, channels: 3, background: '#5a7fa0' } })
      .jpeg()
      .toBuffer(),
  );
  const at = t.clock.now();
  const file = await recordFile(t.db, {
    sha256: stored.sha256,
    size: stored.size,
    mediaType: 'image/jpeg',
    at,
  });
  const iso = at.toISOString();
  const frame = await t.db
    .insertInto('frames')
    .values({
      roll_id: rollId,
      frame_index: index,
      source_file_id: file.id,
      file_name: `f${index}.tif`,
      width: 1200,
      height: 800,
      bit_depth: 16,
      base_region: null,
      base_source: null,
      base_measured: null,
      adjustments: '{}',
      status: 'done',
      error: null,
      rendered_at: iso,
      created_at: iso,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  for (const kind of ['preview', 'jpeg'] as const) {
    await t.db
      .insertInto('frame_outputs')
      .values({ frame_id: frame.id, kind, file_id: file.id, created_at: iso })
      .execute();
  }
  await t.db
    .insertInto('frame_reviews')
    .values({ frame_id: frame.id, decision, note: '', reviewed_by: by, reviewed_at: iso })
    .execute();
  return frame.id;
}

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'customer', 'ines@example.test');
  await addUser(t.db, 'customer', 'olek@example.test');
  const operatorId = await addUser(t.db, 'operator', 'op@lab.test');
  const { stockId } = await addTestCatalogue(t.db);
  owner = await signedIn(t.app, 'ines@example.test');
  stranger = await signedIn(t.app, 'olek@example.test');
  operator = await signedIn(t.app, 'op@lab.test');
  const order = await owner.post('/api/orders', { outputFormats: ['jpeg'] }).expect(201);
  orderId = order.body.id as number;
  const roll = await owner
    .post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' })
    .expect(201);
  frameIds.push(await addRenderedFrame(roll.body.id as number, 1, 'approved', operatorId));
  frameIds.push(await addRenderedFrame(roll.body.id as number, 2, 'excluded', operatorId));
  // ready and paid in full (starter price list: 20.00 a 135-36 C-41 roll), so its files are released
  const iso = t.clock.now().toISOString();
  await t.db.updateTable('orders').set({ status: 'ready' }).where('id', '=', orderId).execute();
  await t.db
    .insertInto('payments')
    .values({
      order_id: orderId,
      checkout_session_id: 'cs_test_gallery',
      amount_minor: 2000,
      currency: 'EUR',
      status: 'paid',
      payment_intent_id: 'pi_gallery',
      created_at: iso,
      updated_at: iso,
      paid_at: iso,
    })
    .execute();
});
afterAll(() => t.close());

describe('an order’s gallery', () => {
  it('lists the finished frames the customer receives, with thumbnail, preview and download URLs', async () => {
    const res = await owner.get(`/api/orders/${orderId}/gallery`).expect(200);
    expect(res.body).toEqual({
      orderId,
      release: { fullSize: true, reason: null },
      balance: { currency: 'EUR', priceMinor: 2000, paidMinor: 2000, dueMinor: 0 },
      frames: [
        {
          id: frameIds[0],
          rollId: expect.any(Number),
          rollNumber: 1,
          index: 1,
          fileName: 'f1.tif',
          width: 1200,
          height: 800,
          thumbnailUrl: `/api/frames/${frameIds[0]}/thumbnail`,
          previewUrl: `/api/frames/${frameIds[0]}/preview`,
          downloads: [{ format: 'jpeg', url: `/api/frames/${frameIds[0]}/output?format=jpeg` }],
        },
      ],
    });
  });

  it('serves thumbnails 360 pixels on the long edge', async () => {
    const res = await owner
      .get(`/api/frames/${frameIds[0]}/thumbnail`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    const meta = await sharp(res.body as Buffer).metadata();
    expect([meta.width, meta.height, meta.format]).toEqual([360, 240, 'jpeg']);
  });

  it('is open to staff and hidden from other customers, thumbnails too', async () => {
    await operator.get(`/api/orders/${orderId}/gallery`).expect(200);
    await stranger.get(`/api/orders/${orderId}/gallery`).expect(404);
    await stranger.get(`/api/frames/${frameIds[0]}/thumbnail`).expect(404);
    await stranger.get(`/api/orders/${orderId + 1}/gallery`).expect(404);
  });
});
