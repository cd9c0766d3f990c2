import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, signedIn, type TestApp } from '../test-support/test-app';
import { starterPriceList } from './price-list-store';

let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'manager');
  await addUser(t.db, 'customer');
});
afterAll(() => t.close());

const edited = {
  currency: 'GBP',
  develop: [{ format: '135-36', process: 'C-41', amountMinor: 1100 }],
  scan: [{ size: 'standard', amountMinor: 700 }],
  pushPullPerStopMinor: 250,
  returnByPostMinor: 400,
};

describe('the price list', () => {
  it('starts from the starter list, which anyone signed in can read', async () => {
    const customer = await signedIn(t.app, 'customer@lab.test');
    const res = await customer.get('/api/prices');
    expect(res.status).toBe(200);
    expect(res.body).toEqual(starterPriceList);
  });

  it('is replaced by a manager, audited, and then quotes use it', async () => {
    const manager = await signedIn(t.app, 'manager@lab.test');
    expect((await manager.send('put', '/api/prices', edited)).status).toBe(200);
    const customer = await signedIn(t.app, 'customer@lab.test');
    expect((await customer.get('/api/prices')).body).toEqual(edited);

    const quote = await customer.post('/api/prices/quote', {
      scanSize: 'standard',
      rolls: [{ format: '135-36', process: 'C-41', pushPull: 1 }],
    });
    expect(quote.status).toBe(200);
    expect(quote.body).toMatchObject({ currency: 'GBP', totalMinor: 1100 + 700 + 250 });
    const posted = await customer.post('/api/prices/quote', {
      scanSize: 'standard',
      negatives: 'post',
      rolls: [{ format: '135-36', process: 'C-41', pushPull: 0 }],
    });
    expect(posted.body).toMatchObject({ currency: 'GBP', totalMinor: 1100 + 700 + 400 });

    const audit = await t.db.selectFrom('audit_log').selectAll().where('target', '=', 'price-list').execute();
    expect(audit).toHaveLength(1);
  });

  it('reads a list saved before postage was priced as posting for free', async () => {
    const { returnByPostMinor: _dropped, ...older } = edited;
    await t.db
      .updateTable('settings')
      .set({ value: JSON.stringify(older) })
      .where('key', '=', 'price-list')
      .execute();
    const customer = await signedIn(t.app, 'customer@lab.test');
    expect((await customer.get('/api/prices')).body).toEqual({ ...older, returnByPostMinor: 0 });
  });

  it('refuses a fractional amount and a format listed twice, naming the field', async () => {
    const manager = await signedIn(t.app, 'manager@lab.test');
    const fractional = await manager.send('put', '/api/prices', {
      ...edited,
      develop: [{ format: '120', process: 'C-41', amountMinor: 10.5 }],
    });
    expect(fractional.status).toBe(400);
    expect(fractional.body.errors.map((e: { path: string }) => e.path)).toEqual([
      'body.develop.0.amountMinor',
    ]);

    const twice = await manager.send('put', '/api/prices', {
      ...edited,
      develop: [
        { format: '120', process: 'C-41', amountMinor: 1000 },
        { format: '120', process: 'C-41', amountMinor: 1100 },
      ],
    });
    expect(twice.status).toBe(400);
    expect(twice.body.errors).toEqual([
      { path: 'body.develop', message: 'List each format and process once' },
    ]);
  });

  it('is edited by managers only', async () => {
    const customer = await signedIn(t.app, 'customer@lab.test');
    expect((await customer.send('put', '/api/prices', edited)).status).toBe(403);
  });

  it('answers 422 naming what has no price', async () => {
    const customer = await signedIn(t.app, 'customer@lab.test');
    const res = await customer.post('/api/prices/quote', {
      scanSize: 'large',
      rolls: [{ format: '120', process: 'C-41', pushPull: 0 }],
    });
    expect(res.status).toBe(422);
    expect(res.body.detail).toContain('scan size large');
    expect(res.body.detail).toContain('120 C-41');
  });
});
