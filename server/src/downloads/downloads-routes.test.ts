import request, { type Response } from 'supertest';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addTestCatalogue } from '../orders/order-test-fixtures';
import { addRenderedFrame } from '../test-support/rendered-frame';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { zipEntries } from './zip-entries';

let t: TestApp;
let alice: Client;
let bruno: Client;
let operator: Client;
let operatorId: number;
let stockId: number;

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'customer', 'alice@example.test');
  await addUser(t.db, 'customer', 'bruno@example.test');
  operatorId = await addUser(t.db, 'operator', 'op@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  alice = await signedIn(t.app, 'alice@example.test');
  bruno = await signedIn(t.app, 'bruno@example.test');
  operator = await signedIn(t.app, 'op@lab.test');
});
afterAll(() => t.close());

/** Collects a binary response body whole (the test's side only: the server streams it). */
function binary(res: Response, done: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
}

/** A finished frame written straight to the tables: a small JPEG output and preview, and the operator's review. */
async function addFinishedFrame(
  rollId: number,
  index: number,
  decision: 'approved' | 'excluded' | null = 'approved',
): Promise<number> {
  return addRenderedFrame(t, {
    rollId,
    index,
    fileName: `scan-${String(index).padStart(2, '0')}.tif`,
    size: { width: 24, height: 16 },
    colour: { r: 40 * index, g: 120, b: 200 },
    outputs: ['jpeg', 'preview'],
    decision,
    reviewerId: operatorId,
  });
}

async function placeOrder(who: Client, rolls: number): Promise<{ orderId: number; rollIds: number[] }> {
  const order = await who.post('/api/orders', { outputFormats: ['jpeg'] }).expect(201);
  const rollIds: number[] = [];
  for (let i = 0; i < rolls; i++) {
    const roll = await who
      .post(`/api/orders/${order.body.id}/rolls`, { stockId, ei: 200, pushPull: 0, format: '135-36' })
      .expect(201);
    rollIds.push(roll.body.id as number);
  }
  return { orderId: order.body.id as number, rollIds };
}

/** The order as a customer gets its files: ready, and paid in full (a payment the provider confirmed). */
async function release(orderId: number, rolls: number): Promise<void> {
  const iso = t.clock.now().toISOString();
  await t.db.updateTable('orders').set({ status: 'ready' }).where('id', '=', orderId).execute();
  await t.db
    .insertInto('payments')
    .values({
      order_id: orderId,
      checkout_session_id: `cs_test_release_${orderId}`,
      // starter price list: 12.00 develop + 8.00 scan per 135-36 C-41 roll
      amount_minor: 2000 * rolls,
      currency: 'EUR',
      status: 'paid',
      payment_intent_id: `pi_release_${orderId}`,
      created_at: iso,
      updated_at: iso,
      paid_at: iso,
    })
    .execute();
}

async function linkFor(who: Client, orderId: number): Promise<string> {
  const res = await who.post(`/api/orders/${orderId}/download-links`).expect(201);
  return new URL(res.body.url as string).pathname;
}

describe('download links', () => {
  it('stream the whole order as a zip of stored entries, one per approved frame, leaving out the rest', async () => {
    const { orderId, rollIds } = await placeOrder(alice, 2);
    await addFinishedFrame(rollIds[0]!, 1);
    await addFinishedFrame(rollIds[0]!, 2);
    await addFinishedFrame(rollIds[0]!, 3, 'excluded');
    await addFinishedFrame(rollIds[1]!, 1, null);
    await addFinishedFrame(rollIds[1]!, 2);
    await release(orderId, 2);

    const path = await linkFor(alice, orderId);
    const res = await alice.get(path).buffer(true).parse(binary).expect(200);

    expect(res.headers['content-type']).toBe('application/zip');
    expect(res.headers['content-disposition']).toContain(`order-${orderId}-scans.zip`);
    const entries = zipEntries(res.body as Buffer);
    expect(entries.map((e) => e.name)).toEqual([
      'roll-1/scan-01.jpg',
      'roll-1/scan-02.jpg',
      'roll-2/scan-02.jpg',
    ]);
    expect(entries.every((e) => e.method === 0 && e.size > 0)).toBe(true);
  });

  it('serve one frame with ?frame=ID, and refuse a frame of another order', async () => {
    const { orderId, rollIds } = await placeOrder(alice, 1);
    const frameId = await addFinishedFrame(rollIds[0]!, 4);
    const other = await placeOrder(alice, 1);
    const otherFrame = await addFinishedFrame(other.rollIds[0]!, 1);
    await release(orderId, 1);
    await release(other.orderId, 1);
    const path = await linkFor(alice, orderId);

    const one = await alice.get(`${path}?frame=${frameId}`).buffer(true).parse(binary).expect(200);
    expect(one.headers['content-type']).toBe('image/jpeg');
    expect(one.headers['content-disposition']).toContain('roll-1-scan-04.jpg');
    expect((await sharp(one.body as Buffer).metadata()).width).toBe(24);

    const refused = await alice.get(`${path}?frame=${otherFrame}`).expect(404);
    expect(refused.headers['content-type']).toContain('application/problem+json');
  });

  it('work for staff on any order, and answer 409 while an order has nothing finished', async () => {
    const { orderId, rollIds } = await placeOrder(alice, 1);
    const path = await linkFor(operator, orderId);
    await operator.get(path).expect(409);
    await addFinishedFrame(rollIds[0]!, 1);
    await operator.get(path).buffer(true).parse(binary).expect(200);
  });

  it('answer 410 once expired, by the app’s clock, and 404 for a token nobody issued', async () => {
    const { orderId, rollIds } = await placeOrder(alice, 1);
    await addFinishedFrame(rollIds[0]!, 1);
    await release(orderId, 1);
    const issued = t.clock.now();
    const path = await linkFor(alice, orderId);
    try {
      t.clock.set(new Date(issued.getTime() + 7 * 24 * 3600_000 - 1000));
      await alice.get(path).buffer(true).parse(binary).expect(200);
      t.clock.set(new Date(issued.getTime() + 7 * 24 * 3600_000));
      const gone = await alice.get(path).expect(410);
      expect(gone.body).toMatchObject({ status: 410, code: 'download-link-expired' });
    } finally {
      t.clock.set(issued);
    }
    const unknown = await alice.get('/api/downloads/not-a-token-anyone-made').expect(404);
    expect(unknown.body).toMatchObject({ status: 404 });
  });

  it('need a signed-in account: the link alone opens nothing', async () => {
    const { orderId } = await placeOrder(alice, 1);
    await release(orderId, 1);
    const path = await linkFor(alice, orderId);
    await request(t.app).get(path).expect(401);
  });
});

describe('one customer cannot reach another’s scans', () => {
  it('by order id, frame preview or output, the zip link, guessed ids, or a link after expiry', async () => {
    const { orderId, rollIds } = await placeOrder(alice, 1);
    const frameId = await addFinishedFrame(rollIds[0]!, 1);
    await release(orderId, 1);
    const alicesLink = await linkFor(alice, orderId);

    const notFound = (res: { status: number }) => expect(res.status).toBe(404);
    notFound(await bruno.get(`/api/orders/${orderId}`));
    notFound(await bruno.post(`/api/orders/${orderId}/download-links`));
    notFound(await bruno.get(`/api/frames/${frameId}`));
    notFound(await bruno.get(`/api/frames/${frameId}/preview`));
    notFound(await bruno.get(`/api/frames/${frameId}/output?format=jpeg`));
    // holding the link itself is not enough: it answers as if it did not exist
    notFound(await bruno.get(alicesLink));
    notFound(await bruno.get(`${alicesLink}?frame=${frameId}`));
    // guessing: the order ids just before and after
    notFound(await bruno.post(`/api/orders/${orderId + 1}/download-links`));
    const issued = t.clock.now();
    try {
      t.clock.set(new Date(issued.getTime() + 30 * 24 * 3600_000));
      notFound(await bruno.get(alicesLink));
    } finally {
      t.clock.set(issued);
    }
  });
});
