import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  testPassword,
  type TestApp,
} from '../test-support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ LOGIN_RATE_LIMIT_MAX: '3' });
  await addUser(t.db, 'admin', 'admin@lab.test');
  await addUser(t.db, 'operator', 'op@lab.test');
  await addUser(t.db, 'customer', 'gone@lab.test', true);
});
afterAll(() => t.close());

describe('sign-in', () => {
  it('signs in with the right password, sets an httpOnly session cookie and answers the user', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/login', { email: 'OP@lab.test ', password: testPassword });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      user: { id: expect.any(Number), email: 'op@lab.test', name: 'Test operator', role: 'operator' },
    });
    const cookie = ([] as string[])
      .concat(res.headers['set-cookie'] ?? [])
      .find((x) => x.startsWith('clearbase.sid='));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.email).toBe('op@lab.test');
  });

  it('gives a new session id at sign-in', async () => {
    const c = await client(t.app);
    await c.post('/api/auth/login', { email: 'nobody@lab.test', password: 'x' });
    const before = await c.agent.get('/api/health');
    const res = await c.post('/api/auth/login', { email: 'admin@lab.test', password: testPassword });
    const sid = ([] as string[])
      .concat(res.headers['set-cookie'] ?? [])
      .find((x) => x.startsWith('clearbase.sid='));
    expect(sid).toBeDefined();
    expect(before.headers['set-cookie']?.toString() ?? '').not.toContain(sid!.split(';')[0]);
  });

  it('answers one generic 401 for a wrong password, an unknown e-mail and a disabled account', async () => {
    const c = await client(t.app);
    const answers = await Promise.all([
      c.post('/api/auth/login', { email: 'op@lab.test', password: 'wrong-password' }),
      c.post('/api/auth/login', { email: 'ghost@lab.test', password: testPassword }),
      c.post('/api/auth/login', { email: 'gone@lab.test', password: testPassword }),
    ]);
    for (const res of answers) {
      expect(res.status).toBe(401);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    }
    expect(new Set(answers.map((r) => r.body.detail)).size).toBe(1);
  });

  it('refuses further attempts for an address and e-mail with 429 after too many failures', async () => {
    const c = await client(t.app);
    for (let i = 0; i < 3; i++) {
      expect((await c.post('/api/auth/login', { email: 'limited@lab.test', password: 'nope' })).status).toBe(
        401,
      );
    }
    const res = await c.post('/api/auth/login', { email: 'limited@lab.test', password: 'nope' });
    expect(res.status).toBe(429);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.body.detail).toMatch(/Too many failed sign-in attempts/);
    // another e-mail from the same address is still let through
    expect((await c.post('/api/auth/login', { email: 'op@lab.test', password: testPassword })).status).toBe(
      200,
    );
  });

  it('signs out with 204 and the session no longer works', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    expect((await c.post('/api/auth/logout')).status).toBe(204);
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(401);
    expect(me.headers['content-type']).toMatch(/^application\/problem\+json/);
  });

  it('answers 401 on /api/auth/me when nobody is signed in', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body).toMatchObject({ status: 401, title: 'Unauthorized' });
  });
});

describe('password change', () => {
  it('changes the password, keeps this session and ends the other sessions of the user', async () => {
    await addUser(t.db, 'manager', 'mgr@lab.test');
    const here = await signedIn(t.app, 'mgr@lab.test');
    const elsewhere = await signedIn(t.app, 'mgr@lab.test');
    const res = await here.post('/api/auth/password', {
      currentPassword: testPassword,
      newPassword: 'a-new-long-password',
    });
    expect(res.status).toBe(204);
    expect((await here.get('/api/auth/me')).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    const c = await client(t.app);
    expect((await c.post('/api/auth/login', { email: 'mgr@lab.test', password: testPassword })).status).toBe(
      401,
    );
    expect(
      (await c.post('/api/auth/login', { email: 'mgr@lab.test', password: 'a-new-long-password' })).status,
    ).toBe(200);
  });

  it('refuses a wrong current password with 400 naming the field', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    const res = await c.post('/api/auth/password', {
      currentPassword: 'not-it',
      newPassword: 'a-new-long-password',
    });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.currentPassword', message: 'The current password is not right.' },
    ]);
  });

  it('refuses a short new password, listing the field', async () => {
    const c = await signedIn(t.app, 'op@lab.test');
    const res = await c.post('/api/auth/password', { currentPassword: testPassword, newPassword: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([
      { path: 'body.newPassword', message: 'Use at least 10 characters for the password' },
    ]);
  });
});
