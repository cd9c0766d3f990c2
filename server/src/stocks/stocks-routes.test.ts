import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signInRoles } from '../test-support/sign-in-roles';
import { createTestApp, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let manager: Client;
let operator: Client;
let customer: Client;
beforeAll(async () => {
  t = await createTestApp();
  ({ manager, operator, customer } = await signInRoles(t, ['manager', 'operator', 'customer']));
});
afterAll(() => t.close());

const tealLine = {
  name: 'Tealine 200',
  maker: 'Harrowgate Emulsions',
  iso: 200,
  process: 'C-41',
  masked: false,
  baseMaterial: 'clear polyester',
  frameFormats: ['135-36'],
  notes: 'Thin base.',
};

describe('stocks', () => {
  it('lets a manager add a stock that any signed-in user then sees in the catalogue', async () => {
    const created = await manager.post('/api/stocks', tealLine);
    expect(created.status).toBe(201);
    expect(created.body.stock).toMatchObject({ ...tealLine, id: expect.any(Number) });
    const list = await customer.get('/api/stocks');
    expect(list.status).toBe(200);
    expect(list.body.stocks.map((s: { name: string }) => s.name)).toEqual(['Tealine 200']);
  });

  it('refuses an operator adding a stock (403) and a duplicate name (409 problem)', async () => {
    expect((await operator.post('/api/stocks', { ...tealLine, name: 'Other' })).status).toBe(403);
    const dup = await manager.post('/api/stocks', tealLine);
    expect(dup.status).toBe(409);
    expect(dup.headers['content-type']).toMatch(/^application\/problem\+json/);
  });

  it('answers a stock page with its (empty) profiles, and 404 for an unknown id', async () => {
    const [stock] = (await customer.get('/api/stocks')).body.stocks;
    const page = await customer.get(`/api/stocks/${stock.id}`);
    expect(page.status).toBe(200);
    expect(page.body).toEqual({ stock, profiles: [] });
    expect((await customer.get('/api/stocks/999')).status).toBe(404);
  });

  it('lists each invalid field of a new stock with its path', async () => {
    const res = await manager.post('/api/stocks', { ...tealLine, name: 'X', iso: 0, process: 'K-14' });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['body.iso', 'body.process']);
  });

  it('audits the creation with before and after', async () => {
    const row = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'stock-created')
      .executeTakeFirstOrThrow();
    expect(row.actor_email).toBe('manager@lab.test');
    expect(JSON.parse(row.details!)).toMatchObject({ before: null, after: { name: 'Tealine 200' } });
  });
});

describe('catalogue filters', () => {
  it('narrows by process, masking and a search of name or maker, ignoring case', async () => {
    await manager.post('/api/stocks', {
      ...tealLine,
      name: 'Kestrel Colour 160',
      maker: 'Corvel Film Works',
      masked: true,
    });
    await manager.post('/api/stocks', {
      ...tealLine,
      name: 'Mono 50%',
      maker: 'Corvel Film Works',
      process: 'black-and-white',
    });
    const names = async (query: string) =>
      (await customer.get(`/api/stocks?${query}`)).body.stocks.map((s: { name: string }) => s.name);
    expect(await names('masked=true')).toEqual(['Kestrel Colour 160']);
    expect(await names('masked=false&process=C-41')).toEqual(['Tealine 200']);
    expect(await names('q=corvel')).toEqual(['Kestrel Colour 160', 'Mono 50%']);
    expect(await names('q=50%25')).toEqual(['Mono 50%']);
    expect(await names('q=5_')).toEqual([]);
    const bad = await customer.get('/api/stocks?masked=maybe');
    expect(bad.status).toBe(400);
    expect(bad.body.errors[0].path).toBe('query.masked');
  });
});

describe('stock sheet', () => {
  it('gives a stock added without sheet fields the box speed, no stated latitude and p = 1.3', async () => {
    const [stock] = (await customer.get('/api/stocks?q=tealine')).body.stocks;
    expect(stock).toMatchObject({
      recommendedEi: null,
      latitudeUnderStops: null,
      latitudeOverStops: null,
      pushPullNotes: '',
      // p = 1.3 for many films: common practice of the trade
      reciprocityExponent: 1.3,
      handlingNotes: '',
    });
  });

  it('keeps the EI, latitude, notes and reciprocity exponent a manager gives a new stock', async () => {
    const sheet = {
      recommendedEi: 320,
      latitudeUnderStops: 1,
      latitudeOverStops: 3,
      pushPullNotes: 'Pushes one stop cleanly.',
      reciprocityExponent: 1.35,
      handlingNotes: 'Thin polyester base: load by hand in cameras that load themselves.',
    };
    const created = await manager.post('/api/stocks', { ...tealLine, name: 'Sheeted 400', ...sheet });
    expect(created.status).toBe(201);
    const page = await customer.get(`/api/stocks/${created.body.stock.id}`);
    expect(page.body.stock).toMatchObject(sheet);
  });

  it('names each out-of-range sheet field', async () => {
    const res = await manager.post('/api/stocks', {
      ...tealLine,
      name: 'Out of range',
      recommendedEi: 3,
      latitudeOverStops: -1,
      reciprocityExponent: 0.5,
    });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
      'body.latitudeOverStops',
      'body.reciprocityExponent',
      'body.recommendedEi',
    ]);
  });
});

describe('changing a stock sheet', () => {
  it('lets a manager change the sheet fields given, keeps the others, and audits before and after', async () => {
    const created = await manager.post('/api/stocks', { ...tealLine, name: 'Resheeted 100', notes: 'Kept.' });
    const id = created.body.stock.id;
    const res = await manager.patch(`/api/stocks/${id}`, {
      recommendedEi: 80,
      reciprocityExponent: 1.4,
      handlingNotes: 'Load by hand.',
    });
    expect(res.status).toBe(200);
    expect(res.body.stock).toMatchObject({
      name: 'Resheeted 100',
      notes: 'Kept.',
      recommendedEi: 80,
      reciprocityExponent: 1.4,
      handlingNotes: 'Load by hand.',
    });
    const cleared = await manager.patch(`/api/stocks/${id}`, { recommendedEi: null });
    expect(cleared.body.stock).toMatchObject({ recommendedEi: null, reciprocityExponent: 1.4 });
    const audit = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'stock-sheet-updated')
      .where('target', '=', `stock:${id}`)
      .orderBy('id')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(audit.details!)).toMatchObject({
      before: { recommendedEi: null, reciprocityExponent: 1.3 },
      after: { recommendedEi: 80, reciprocityExponent: 1.4 },
    });
  });

  it('refuses operators (403), unknown stocks (404), a change of name and an out-of-range p (400)', async () => {
    const [stock] = (await customer.get('/api/stocks?q=tealine')).body.stocks;
    expect((await operator.patch(`/api/stocks/${stock.id}`, { notes: 'x' })).status).toBe(403);
    expect((await manager.patch('/api/stocks/9999', { notes: 'x' })).status).toBe(404);
    const renamed = await manager.patch(`/api/stocks/${stock.id}`, { name: 'Other', reciprocityExponent: 3 });
    expect(renamed.status).toBe(400);
    expect(renamed.body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
      'body',
      'body.reciprocityExponent',
    ]);
  });
});

describe('a stock page', () => {
  it('names who made and who published each version', async () => {
    const [stock] = (await customer.get('/api/stocks?q=tealine')).body.stocks;
    const made = await operator.post('/api/profiles', { stockId: stock.id, name: 'House profile' });
    expect(made.status).toBe(201);
    const versionId = made.body.version.id;
    expect(
      (await manager.post(`/api/profile-versions/${versionId}/publish`, { changelog: 'First release' }))
        .status,
    ).toBe(200);
    const page = await operator.get(`/api/stocks/${stock.id}`);
    expect(page.body.profiles[0].versions[0]).toMatchObject({
      id: versionId,
      createdByName: 'Test operator',
      publishedByName: 'Test manager',
    });
  });
});

describe('scanners', () => {
  const rig = {
    name: 'Copy stand one',
    kind: 'camera-rig',
    inputProfile: {
      name: 'Copy stand one',
      encoding: 'linear',
      gamma: 1,
      blackLevel: [0.002, 0.002, 0.002],
      gains: [1, 1.1, 1.3],
    },
  };

  it('lets a manager add a scanner that staff read but customers may not', async () => {
    const created = await manager.post('/api/scanners', rig);
    expect(created.status).toBe(201);
    expect(created.body.scanner).toMatchObject(rig);
    const list = await operator.get('/api/scanners');
    expect(list.body.scanners).toHaveLength(1);
    expect((await customer.get('/api/scanners')).status).toBe(403);
    expect((await operator.post('/api/scanners', { ...rig, name: 'Other' })).status).toBe(403);
  });

  it('names the invalid field of an input profile', async () => {
    const res = await manager.post('/api/scanners', {
      ...rig,
      name: 'Bad',
      inputProfile: { ...rig.inputProfile, gains: [1, 0, 1] },
    });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('body.inputProfile.gains.1');
  });
});
