import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  testPassword,
  type Client,
  type TestApp,
} from '../test-support/test-app';

let t: TestApp;
let admin: Client;
let adminId: number;
beforeAll(async () => {
  t = await createTestApp();
  adminId = await addUser(t.db, 'admin', 'admin@lab.test');
  admin = await signedIn(t.app, 'admin@lab.test');
});
afterAll(() => t.close());

describe('users, for admins', () => {
  it('lists users as records with disabled flag and dates', async () => {
    const res = await admin.get('/api/users');
    expect(res.status).toBe(200);
    expect(res.body.users).toEqual([
      {
        id: adminId,
        email: 'admin@lab.test',
        name: 'Test admin',
        role: 'admin',
        disabled: false,
        createdAt: expect.any(String),
        lastSignInAt: '2026-03-02T09:00:00.000Z',
      },
    ]);
  });

  it('creates a user with a given password, who can then sign in', async () => {
    const res = await admin.post('/api/users', {
      email: 'Ana@Lab.test',
      name: 'Ana Vell',
      role: 'operator',
      password: 'a-long-password',
    });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({
      email: 'ana@lab.test',
      name: 'Ana Vell',
      role: 'operator',
      disabled: false,
    });
    expect(res.body.temporaryPassword).toBeUndefined();
    const c = await client(t.app);
    expect(
      (await c.post('/api/auth/login', { email: 'ana@lab.test', password: 'a-long-password' })).status,
    ).toBe(200);
  });

  it('creates a user without a password and returns a temporary one that works', async () => {
    const res = await admin.post('/api/users', { email: 'bo@lab.test', name: 'Bo Trand', role: 'customer' });
    expect(res.status).toBe(201);
    expect(res.body.temporaryPassword).toMatch(/^[A-Za-z0-9_-]{20}$/);
    const c = await client(t.app);
    expect(
      (await c.post('/api/auth/login', { email: 'bo@lab.test', password: res.body.temporaryPassword }))
        .status,
    ).toBe(200);
  });

  it('refuses a duplicate e-mail with 409', async () => {
    const res = await admin.post('/api/users', { email: 'ANA@lab.test', name: 'Other', role: 'customer' });
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
  });

  it('changes role and name, and disabling ends the user’s sessions', async () => {
    const id = await addUser(t.db, 'customer', 'cal@lab.test');
    const cal = await signedIn(t.app, 'cal@lab.test');
    const renamed = await admin.patch(`/api/users/${id}`, { name: 'Cal Brisk', role: 'operator' });
    expect(renamed.status).toBe(200);
    expect(renamed.body.user).toMatchObject({ name: 'Cal Brisk', role: 'operator' });

    const again = await signedIn(t.app, 'cal@lab.test');
    const disabled = await admin.patch(`/api/users/${id}`, { disabled: true });
    expect(disabled.body.user.disabled).toBe(true);
    expect((await cal.get('/api/auth/me')).status).toBe(401);
    expect((await again.get('/api/auth/me')).status).toBe(401);
    const c = await client(t.app);
    expect((await c.post('/api/auth/login', { email: 'cal@lab.test', password: testPassword })).status).toBe(
      401,
    );
  });

  it('refuses to let an admin disable or demote themself (409)', async () => {
    const demote = await admin.patch(`/api/users/${adminId}`, { role: 'manager' });
    expect(demote.status).toBe(409);
    expect(demote.body.detail).toMatch(/own role/);
    const disable = await admin.patch(`/api/users/${adminId}`, { disabled: true });
    expect(disable.status).toBe(409);
    expect((await admin.get('/api/auth/me')).body.role).toBe('admin');
  });

  it('answers 404 for an unknown user and 400 for an empty change', async () => {
    expect((await admin.patch('/api/users/9999', { name: 'X' })).status).toBe(404);
    const empty = await admin.patch(`/api/users/${adminId}`, {});
    expect(empty.status).toBe(400);
    expect(empty.body.errors[0].message).toBe('Change at least one of name, role or disabled');
  });
});

describe('audit log', () => {
  it('records sign-ins, failed sign-ins, sign-outs, creations, role changes, disabling and password changes', async () => {
    const c = await client(t.app);
    await c.post('/api/auth/login', { email: 'admin@lab.test', password: 'wrong-one' });
    const dee = await admin.post('/api/users', {
      email: 'dee@lab.test',
      name: 'Dee',
      role: 'customer',
      password: 'dee-password-1',
    });
    await admin.patch(`/api/users/${dee.body.user.id}`, { role: 'operator' });
    const deeClient = await client(t.app);
    await deeClient.post('/api/auth/login', { email: 'dee@lab.test', password: 'dee-password-1' });
    await deeClient.post('/api/auth/password', {
      currentPassword: 'dee-password-1',
      newPassword: 'dee-password-2',
    });
    await deeClient.post('/api/auth/logout');
    await admin.patch(`/api/users/${dee.body.user.id}`, { disabled: true });

    const res = await admin.get('/api/audit?limit=500');
    expect(res.status).toBe(200);
    const actions = new Set(res.body.entries.map((e: { action: string }) => e.action));
    for (const a of [
      'sign-in',
      'sign-in-failed',
      'sign-out',
      'user-created',
      'user-role-changed',
      'user-disabled',
      'password-changed',
    ]) {
      expect(actions).toContain(a);
    }
    expect(res.body.total).toBe(res.body.entries.length);
    const role = res.body.entries.find(
      (e: { action: string; target: string | null }) =>
        e.action === 'user-role-changed' && e.target === `user:${dee.body.user.id}`,
    );
    expect(role).toMatchObject({
      actorEmail: 'admin@lab.test',
      details: { from: 'customer', to: 'operator' },
    });
  });

  it('filters by action and pages with limit and offset', async () => {
    const all = await admin.get('/api/audit?action=sign-in');
    expect(all.body.entries.every((e: { action: string }) => e.action === 'sign-in')).toBe(true);
    const page = await admin.get('/api/audit?action=sign-in&limit=1&offset=1');
    expect(page.body.entries).toHaveLength(1);
    expect(page.body.entries[0].id).toBe(all.body.entries[1].id);
    expect(page.body.total).toBe(all.body.total);
  });

  it('refuses a limit out of range with 400 naming the field', async () => {
    const res = await admin.get('/api/audit?limit=0');
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('query.limit');
  });
});
