import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { KyselySessionStore } from './kysely-session-store';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  testPassword,
  type TestApp,
} from '../test-support/test-app';

let t: TestApp;
let secure: TestApp;
beforeAll(async () => {
  t = await createTestApp({ SESSION_MAX_AGE_HOURS: '2' });
  secure = await createTestApp({ PUBLIC_URL: 'https://lab.example.test' });
  await addUser(t.db, 'operator', 'op@lab.test');
  await addUser(secure.db, 'operator', 'op@lab.test');
});
afterAll(async () => {
  await t.close();
  await secure.close();
});

const sidOf = (res: request.Response) =>
  ([] as string[])
    .concat(res.headers['set-cookie'] ?? [])
    .find((c) => c.startsWith('clearbase.sid='))
    ?.split(';')[0];

describe('sessions', () => {
  it('writes a signed-in session’s row at most once a minute, however many requests it makes', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    // every session row's expiry: only this client's session is used below
    const expiryOf = async () =>
      (await t.db.selectFrom('sessions').select(['sid', 'expires_at']).orderBy('sid').execute()).map(
        (r) => `${r.sid} ${r.expires_at}`,
      );
    const before = await expiryOf();
    for (let i = 0; i < 5; i++) expect((await c.get('/api/auth/me')).status).toBe(200);
    expect(await expiryOf()).toEqual(before);
    const start = t.clock.now();
    t.clock.set(new Date(start.getTime() + 61_000));
    try {
      expect((await c.get('/api/auth/me')).status).toBe(200);
      expect(await expiryOf()).not.toEqual(before);
    } finally {
      t.clock.set(start);
    }
  });

  it('stores the session with the user id, so the user’s sessions can be found', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    expect((await c.get('/api/auth/me')).status).toBe(200);
    const rows = await t.db.selectFrom('sessions').selectAll().execute();
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r) => typeof r.user_id === 'number')).toBe(true);
  });

  it('issues a new session id at each sign-in, so an id planted beforehand is worthless', async () => {
    const c = await client(t.app);
    const first = await c.post('/api/auth/login', { email: 'op@lab.test', password: testPassword });
    const second = await c.post('/api/auth/login', { email: 'op@lab.test', password: testPassword });
    expect(sidOf(first)).toBeDefined();
    expect(sidOf(second)).toBeDefined();
    expect(sidOf(second)).not.toBe(sidOf(first));
    const planted = await request(t.app).get('/api/auth/me').set('Cookie', sidOf(first)!);
    expect(planted.status).toBe(401);
  });

  it('refuses a session past its expiry and prunes it', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    // express-session dates the cookie from the real time; step three hours past it (the limit here is two)
    t.clock.set(new Date(Date.now() + 3 * 3600_000));
    expect((await c.get('/api/auth/me')).status).toBe(401);
    const store = new KyselySessionStore(t.db, t.clock, 3600_000);
    expect(await store.prune()).toBeGreaterThan(0);
    t.clock.set(new Date('2026-03-02T09:00:00Z'));
  });

  it('marks cookies Secure when the public address is https', async () => {
    const c = await client(secure.app);
    // the agent keeps Secure cookies to itself over plain http, so the token cookie is sent by hand
    const res = await request(secure.app)
      .post('/api/auth/login')
      .set('Cookie', `XSRF-TOKEN=${c.token}`)
      .set('X-XSRF-TOKEN', c.token)
      .set('X-Forwarded-Proto', 'https')
      .send({ email: 'op@lab.test', password: testPassword });
    expect(res.status).toBe(200);
    const cookie = ([] as string[])
      .concat(res.headers['set-cookie'] ?? [])
      .find((x) => x.startsWith('clearbase.sid='));
    expect(cookie).toMatch(/; Secure/i);
  });
});
