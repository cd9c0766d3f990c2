import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { addRenderedFrame } from '../test-support/rendered-frame';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let owner: Client;
let stranger: Client;
let operator: Client;
let orderId: number;
const frameIds: number[] = [];

/** A rendered frame with a 1200×800 preview and a JPEG output, written straight to the tables. */
async function addFrameTo(rollId: number, index: number, decision: 'approved' | 'excluded', by: number) {
  return addRenderedFrame(t, {
    rollId,
    index,
    fileName: `f${index}.tif`,
    size: { width: 1200, height: 800 },
    colour: '#5a7fa0',
    decision,
    reviewerId: by,
  });
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
  frameIds.push(await addFrameTo(roll.body.id as number, 1, 'approved', operatorId));
  frameIds.push(await addFrameTo(roll.body.id as number, 2, 'excluded', operatorId));
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
