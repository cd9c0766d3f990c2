import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { systemClock } from '../clock';
import { addUser, client, createTestApp, type TestApp } from '../test-support/test-app';
import { listUsers } from '../users/user-repository';
import { demoPassword, demoUsers, seedDemo } from './seed';

let empty: TestApp;
let used: TestApp;
beforeAll(async () => {
  empty = await createTestApp();
  used = await createTestApp();
});
afterAll(async () => {
  await empty.close();
  await used.close();
});

describe('demo seed', () => {
  it('fills an empty database with the demo lab and its four roles, who sign in with the demo password', async () => {
    expect(await seedDemo(empty.db, { clock: systemClock })).toBe(true);
    const users = await listUsers(empty.db);
    expect(users.map((u) => u.email).sort()).toEqual(demoUsers.map((u) => u.email).sort());
    expect(new Set(users.map((u) => u.role))).toEqual(new Set(['admin', 'manager', 'operator', 'customer']));
    const lab = await empty.db
      .selectFrom('settings')
      .select('value')
      .where('key', '=', 'lab')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(lab.value).name).toBe('Clearbase demo lab');
    const c = await client(empty.app);
    const res = await c.post('/api/auth/login', { email: 'manager@clearbase.test', password: demoPassword });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe('manager');
  });

  it('does nothing a second time', async () => {
    expect(await seedDemo(empty.db, { clock: systemClock })).toBe(false);
    expect(await listUsers(empty.db)).toHaveLength(demoUsers.length);
  });

  it('never touches a database that already has users', async () => {
    await addUser(used.db, 'admin', 'owner@lab.test');
    expect(await seedDemo(used.db, { clock: systemClock })).toBe(false);
    expect((await listUsers(used.db)).map((u) => u.email)).toEqual(['owner@lab.test']);
  });
});
