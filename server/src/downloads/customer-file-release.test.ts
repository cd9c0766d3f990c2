import type { OrderStatus, ReviewDecision } from '@clearbase/contracts';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { addRenderedFrame } from '../test-support/rendered-frame';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { zipEntries } from './zip-entries';

let t: TestApp;
let customer: Client;
let operator: Client;
let admin: Client;
let operatorId: number;
let stockId: number;

// starter price list: 12.00 develop + 8.00 scan for a 135-36 C-41 roll at standard size
const rollPriceMinor = 2000;

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'customer', 'wren@example.test');
  operatorId = await addUser(t.db, 'operator', 'op@lab.test');
  await addUser(t.db, 'admin', 'boss@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  customer = await signedIn(t.app, 'wren@example.test');
  operator = await signedIn(t.app, 'op@lab.test');
  admin = await signedIn(t.app, 'boss@lab.test');
});
afterAll(() => t.close());

const binary = (res: Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
};

/** A rendered frame with a preview and a JPEG output, and the operator's decision on it. */
async function addFrame(rollId: number, index: number, decision: ReviewDecision | null): Promise<number> {
  return addRenderedFrame(t, {
    rollId,
    index,
    size: { width: 30, height: 20 },
    colour: '#6080a0',
    decision,
    reviewerId: operatorId,
  });
}

/** An order of one roll with an approved, an excluded, a rejected and an unreviewed frame, in the given status. */
async function orderWithFrames(status: OrderStatus) {
  const order = await customer.post('/api/orders', { outputFormats: ['jpeg'] }).expect(201);
  const orderId = order.body.id as number;
  const roll = await customer
    .post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' })
    .expect(201);
  const rollId = roll.body.id as number;
  const frames = {
    approved: await addFrame(rollId, 1, 'approved'),
    excluded: await addFrame(rollId, 2, 'excluded'),
    rejected: await addFrame(rollId, 3, 'rejected'),
    unreviewed: await addFrame(rollId, 4, null),
  };
  await t.db.updateTable('orders').set({ status }).where('id', '=', orderId).execute();
  return { orderId, frames };
}

/** A payment the provider confirmed, written straight to the table. */
async function paid(orderId: number, amountMinor: number): Promise<void> {
  const iso = t.clock.now().toISOString();
  await t.db
    .insertInto('payments')
    .values({
      order_id: orderId,
      checkout_session_id: `cs_test_${orderId}_${amountMinor}_${Math.random()}`,
      amount_minor: amountMinor,
      currency: 'EUR',
      status: 'paid',
      payment_intent_id: `pi_${orderId}`,
      created_at: iso,
      updated_at: iso,
      paid_at: iso,
    })
    .execute();
}

describe('a customer’s unpaid order still in scanning', () => {
  it('shows thumbnails of approved frames only, and says why there is nothing to download yet', async () => {
    const { orderId, frames } = await orderWithFrames('scanning');
    const res = await customer.get(`/api/orders/${orderId}/gallery`).expect(200);
    expect(res.body.frames.map((f: { id: number }) => f.id)).toEqual([frames.approved]);
    expect(res.body.frames[0]).toMatchObject({
      thumbnailUrl: `/api/frames/${frames.approved}/thumbnail`,
      previewUrl: null,
      downloads: [],
    });
    expect(res.body.release).toEqual({
      fullSize: false,
      reason: `Order ${orderId} is scanning; its full-size scans come once the lab marks it ready.`,
    });
    expect(res.body.balance).toEqual({
      currency: 'EUR',
      priceMinor: rollPriceMinor,
      paidMinor: 0,
      dueMinor: rollPriceMinor,
    });
    await customer.get(`/api/frames/${frames.approved}/thumbnail`).expect(200);
  });

  it('gives no download link, no preview and no full-size file, each with a problem saying why', async () => {
    const { orderId, frames } = await orderWithFrames('scanning');
    const link = await customer.post(`/api/orders/${orderId}/download-links`);
    expect(link.status).toBe(409);
    expect(link.headers['content-type']).toContain('application/problem+json');
    expect(link.body).toMatchObject({ code: 'scans-not-released' });
    expect(link.body.detail).toContain('is scanning');
    const output = await customer.get(`/api/frames/${frames.approved}/output?format=jpeg`);
    expect(output.status).toBe(409);
    expect(output.body.code).toBe('scans-not-released');
    expect((await customer.get(`/api/frames/${frames.approved}/preview`)).status).toBe(409);
  });

  it('keeps the zip from a link staff made, while staff themselves still get it', async () => {
    const { orderId } = await orderWithFrames('scanning');
    const made = await operator.post(`/api/orders/${orderId}/download-links`).expect(201);
    const path = new URL(made.body.url as string).pathname;
    const refused = await customer.get(path);
    expect(refused.status).toBe(409);
    expect(refused.body.code).toBe('scans-not-released');
    expect((await customer.get(`${path}?frame=1`)).status).toBe(409);
    await operator.get(path).buffer(true).parse(binary).expect(200);
  });
});

describe('a frame the lab excluded or rejected', () => {
  it('answers as missing to the customer by output, preview and thumbnail, even on a paid ready order', async () => {
    const { orderId, frames } = await orderWithFrames('ready');
    await paid(orderId, rollPriceMinor);
    for (const id of [frames.excluded, frames.rejected, frames.unreviewed]) {
      expect((await customer.get(`/api/frames/${id}/output?format=jpeg`)).status).toBe(404);
      expect((await customer.get(`/api/frames/${id}/preview`)).status).toBe(404);
      expect((await customer.get(`/api/frames/${id}/thumbnail`)).status).toBe(404);
    }
    await customer.get(`/api/frames/${frames.approved}/output?format=jpeg`).expect(200);
    await operator.get(`/api/frames/${frames.excluded}/output?format=jpeg`).expect(200);
  });
});

describe('a ready order paid in full', () => {
  it('gives the customer previews, files and a zip of the approved frames only', async () => {
    const { orderId, frames } = await orderWithFrames('ready');
    await paid(orderId, rollPriceMinor);
    const gallery = await customer.get(`/api/orders/${orderId}/gallery`).expect(200);
    expect(gallery.body.release).toEqual({ fullSize: true, reason: null });
    expect(gallery.body.frames).toEqual([
      expect.objectContaining({
        id: frames.approved,
        previewUrl: `/api/frames/${frames.approved}/preview`,
        downloads: [{ format: 'jpeg', url: `/api/frames/${frames.approved}/output?format=jpeg` }],
      }),
    ]);
    await customer.get(`/api/frames/${frames.approved}/preview`).expect(200);
    const link = await customer.post(`/api/orders/${orderId}/download-links`).expect(201);
    const path = new URL(link.body.url as string).pathname;
    const zip = await customer.get(path).buffer(true).parse(binary).expect(200);
    expect(zipEntries(zip.body as Buffer).map((e) => e.name)).toEqual(['roll-1/scan-1.jpg']);
    expect((await customer.get(`${path}?frame=${frames.excluded}`)).status).toBe(404);
  });

  it('is held back again, with the balance named, when a roll is added after paying', async () => {
    const { orderId, frames } = await orderWithFrames('ready');
    await paid(orderId, rollPriceMinor);
    await operator.post(`/api/orders/${orderId}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201);
    const res = await customer.get(`/api/frames/${frames.approved}/output?format=jpeg`);
    expect(res.status).toBe(409);
    expect(res.body.detail).toBe(
      `Order ${orderId} has €20.00 left to pay; its full-size scans come once it is paid in full.`,
    );
  });
});

describe('a lab that takes payment on collection', () => {
  it('releases a ready order before it is paid, but not one still being scanned', async () => {
    const lab = { name: 'Reedbank Lab', town: 'Fenwick', address: '1 Dyke Lane', payOnCollection: true };
    await admin.send('put', '/api/lab', lab).expect(200);
    try {
      const ready = await orderWithFrames('ready');
      await customer.get(`/api/frames/${ready.frames.approved}/output?format=jpeg`).expect(200);
      await customer.post(`/api/orders/${ready.orderId}/download-links`).expect(201);
      const scanning = await orderWithFrames('scanning');
      expect((await customer.post(`/api/orders/${scanning.orderId}/download-links`)).status).toBe(409);
    } finally {
      await admin.send('put', '/api/lab', { ...lab, payOnCollection: false }).expect(200);
    }
  });
});
