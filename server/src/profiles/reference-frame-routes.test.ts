import { profileForStock, sceneLinearPixel, type Matrix3, type Rgb } from '@clearbase/inversion';
import request, { type Test } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { StockRow } from '../db/database';
import { signInRoles } from '../test-support/sign-in-roles';
import { tintedTestStock } from '../test-support/tinted-test-stock';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';
import {
  filmStockFor,
  makeReferenceNegative,
  REFERENCE_SIZE,
  type ReferenceFilm,
} from './reference-negative';
import { createReferenceNegativeCache } from './reference-negative-cache';

let t: TestApp;
let operator: Client;
let customer: Client;
let manager: Client;
let draftId: number;
let stockId: number;

beforeAll(async () => {
  t = await createTestApp();
  ({ manager, operator, customer } = await signInRoles(t, ['manager', 'operator', 'customer']));
  stockId = (await manager.post('/api/stocks', tintedTestStock)).body.stock.id;
  const created = await operator.post('/api/profiles', { stockId, name: 'House' });
  draftId = created.body.version.id;
});
afterAll(() => t.close());

const tinted: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'> = {
  name: 'Glasswing 400',
  iso: 400,
  masked: 0,
  base_material: 'tinted polyester',
};
// an invented crosstalk correction, unlike any the demo lab's profiles hold
const ownCrosstalk: Matrix3 = [
  [1.2, -0.15, -0.05],
  [-0.04, 1.1, -0.06],
  [-0.02, -0.2, 1.22],
];
const film: ReferenceFilm = { stock: tinted, crosstalk: ownCrosstalk };

/** Collects a raw pixel reply's body as a Buffer. */
function rawBody(res: Test) {
  return res.buffer(true).parse((r, done) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => done(null, Buffer.concat(chunks)));
  });
}

describe('reference negatives for the profile editor', () => {
  it('answers staff with raw 16-bit RGB of the version’s stock, its size and film base in headers', async () => {
    const res = await operator.agent
      .get(`/api/profile-versions/${draftId}/reference-negative`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/octet-stream');
    const width = Number(res.headers['x-negative-width']);
    const height = Number(res.headers['x-negative-height']);
    expect(width * height).toBeLessThanOrEqual(1_500_000);
    expect(width * height).toBeGreaterThan(1_000_000);
    expect((res.body as Buffer).length).toBe(width * height * 3 * 2);
    const base = String(res.headers['x-film-base']).split(',').map(Number);
    expect(base).toHaveLength(3);
    for (const b of base) expect(b).toBeGreaterThan(0);
    for (const b of base) expect(b).toBeLessThanOrEqual(1);
    expect(res.headers['x-scanner-encoding']).toBe('linear');
  });

  it('refuses customers with 403 and visitors with 401, as problem documents', async () => {
    const asCustomer = await customer.get(`/api/profile-versions/${draftId}/reference-negative`);
    expect(asCustomer.status).toBe(403);
    expect(asCustomer.headers['content-type']).toMatch(/^application\/problem\+json/);
    const anonymous = await request(t.app).get(`/api/profile-versions/${draftId}/reference-negative`);
    expect(anonymous.status).toBe(401);
  });

  it('answers 404 for a version that does not exist', async () => {
    const res = await operator.get('/api/profile-versions/99999/reference-negative');
    expect(res.status).toBe(404);
    expect(res.body.code).toBe('profile-version-not-found');
  });

  it('makes each stock’s negative once and the same bytes every time', async () => {
    const size = { width: 44, height: 20 };
    const referenceFor = createReferenceNegativeCache(size);
    expect(await referenceFor(film)).toBe(await referenceFor(film));
    expect(makeReferenceNegative(film, size).data).toEqual((await referenceFor(film)).data);
  });

  it('lets requests that arrive while a negative is made share that one making, and retries one that failed', async () => {
    const size = { width: 44, height: 20 };
    let makings = 0;
    let fail = true;
    const referenceFor = createReferenceNegativeCache(size, async (stock, at) => {
      makings++;
      await new Promise((r) => setTimeout(r, 20));
      if (fail) throw new Error('worker gone');
      return makeReferenceNegative(stock, at);
    });
    await expect(Promise.all([referenceFor(film), referenceFor(film)])).rejects.toThrow('worker gone');
    expect(makings).toBe(1);
    fail = false;
    const [a, b] = await Promise.all([referenceFor(film), referenceFor(film)]);
    expect(a).toBe(b);
    expect(makings).toBe(2);
  });

  it('keeps the server answering while a stock’s negative is made on a worker thread', async () => {
    const stock = await manager.post('/api/stocks', {
      name: 'Mistral 160',
      maker: 'Harrowgate Emulsions',
      iso: 160,
      process: 'C-41',
      masked: false,
      baseMaterial: 'clear polyester',
      frameFormats: ['135-36'],
    });
    const version = (await operator.post('/api/profiles', { stockId: stock.body.stock.id, name: 'House' }))
      .body.version.id as number;
    const finished: number[] = [];
    const fetchNegative = () =>
      operator.agent
        .get(`/api/profile-versions/${version}/reference-negative`)
        .buffer(true)
        .parse((r, done) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => done(null, Buffer.concat(chunks)));
        })
        .then((res) => {
          finished.push(Date.now());
          return res;
        });
    const negatives = Promise.all([fetchNegative(), fetchNegative()]);
    await new Promise((r) => setTimeout(r, 100));
    for (let i = 0; i < 3; i++) await request(t.app).get('/api/health').expect(200);
    const answered = Date.now();
    const [a, b] = await negatives;
    // the health checks were answered while the negative was still being made: a blocked event loop would have
    // held them until it was done (no bound in milliseconds, which a busy machine would break)
    expect(finished.every((f) => f > answered)).toBe(true);
    expect(a.status).toBe(200);
    expect((a.body as Buffer).equals(b.body as Buffer)).toBe(true);
  });

  it('holds a neutral wedge that the stock’s matching profile renders grey', () => {
    const size = { width: 220, height: 100 };
    const negative = makeReferenceNegative(film, size);
    const profile = profileForStock(filmStockFor(film));
    // the middle of the wedge's sixth step (of eleven), bottom tenth of the frame
    const x = 5 * 20 + 10,
      y = 95;
    const i = (y * negative.width + x) * 3;
    const counts: Rgb = [negative.data[i]!, negative.data[i + 1]!, negative.data[i + 2]!];
    const linear = sceneLinearPixel(
      {
        profile,
        scanner: negative.scanner,
        base: negative.base,
        midLogExposure: Math.log10(0.18),
        render: 'reference',
        outputBits: 8,
      },
      counts,
    );
    // neutral within 3 % between channels (grain of 0.004 D is about 1 %)
    const mean = (linear[0] + linear[1] + linear[2]) / 3;
    for (const v of linear) expect(Math.abs(v / mean - 1)).toBeLessThan(0.03);
  });

  it('keeps the negatives asked for most recently, making again one that was let go', async () => {
    const size = { width: 44, height: 20 };
    let makings = 0;
    const referenceFor = createReferenceNegativeCache(
      size,
      async (f, at) => {
        makings++;
        return makeReferenceNegative(f, at);
      },
      2,
    );
    const other = (iso: number): ReferenceFilm => ({ stock: { ...tinted, iso }, crosstalk: ownCrosstalk });
    await referenceFor(other(100));
    await referenceFor(other(200));
    await referenceFor(other(100));
    await referenceFor(other(400));
    expect(makings).toBe(3);
    await referenceFor(other(100));
    expect(makings).toBe(3);
    await referenceFor(other(200));
    expect(makings).toBe(4);
  });

  it('makes a real stock’s negative with its own profile’s crosstalk, even when a demo stock has the same name', async () => {
    const parameters = (await operator.get(`/api/profile-versions/${draftId}`)).body.version.parameters;
    const created = await operator.post('/api/profiles', {
      stockId,
      name: 'Own crosstalk',
      parameters: { ...parameters, crosstalk: ownCrosstalk },
    });
    expect(created.status).toBe(201);
    const res = await rawBody(
      operator.agent.get(`/api/profile-versions/${created.body.version.id}/reference-negative`),
    );
    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toBe('private, no-cache');
    const row = {
      name: tintedTestStock.name,
      iso: 400,
      masked: 0,
      base_material: tintedTestStock.baseMaterial,
    };
    const own = makeReferenceNegative({ stock: row, crosstalk: ownCrosstalk }, REFERENCE_SIZE);
    expect(
      (res.body as Buffer).equals(Buffer.from(own.data.buffer, own.data.byteOffset, own.data.byteLength)),
    ).toBe(true);
  });
});
