import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createUsersService } from './users-service';

let t: TestApp;
let admin: User;
const users = () => createUsersService({ db: t.db, clock: t.clock });
beforeAll(async () => {
  t = await createTestApp();
  admin = { id: await addUser(t.db, 'admin'), email: 'admin@lab.test', name: 'Test admin', role: 'admin' };
});
afterAll(() => t.close());

const auditsOf = (target: string) =>
  t.db.selectFrom('audit_log').select('action').where('target', '=', target).orderBy('id').execute();

describe('the users service', () => {
  it('creates an account with a temporary password shown once, audited', async () => {
    const { user, temporaryPassword } = await users().create(admin, {
      email: 'new-op@lab.test',
      name: 'New Operator',
      role: 'operator',
    });
    expect(temporaryPassword).toMatch(/.{10,}/);
    expect((await auditsOf(`user:${user.id}`)).map((a) => a.action)).toEqual(['user-created']);
    await expect(
      users().create(admin, { email: 'new-op@lab.test', name: 'Again', role: 'operator' }),
    ).rejects.toMatchObject({ status: 409, code: 'email-taken' });
  });

  it('audits each change on its own and ends the sessions of a disabled account', async () => {
    const id = await addUser(t.db, 'operator', 'leaving@lab.test');
    await t.db
      .insertInto('sessions')
      .values({ sid: 'leaving-session', user_id: id, data: '{}', expires_at: '2099-01-01T00:00:00.000Z' })
      .execute();
    const user = await users().update(admin, id, { name: 'Leaving Soon', role: 'manager', disabled: true });
    expect(user).toMatchObject({ name: 'Leaving Soon', role: 'manager', disabled: true });
    expect((await auditsOf(`user:${id}`)).map((a) => a.action)).toEqual([
      'user-renamed',
      'user-role-changed',
      'user-disabled',
    ]);
    expect(await t.db.selectFrom('sessions').selectAll().where('user_id', '=', id).execute()).toEqual([]);
  });

  it('keeps an admin from disabling or demoting their own account', async () => {
    await expect(users().update(admin, admin.id, { disabled: true })).rejects.toMatchObject({
      code: 'cannot-disable-self',
    });
    await expect(users().update(admin, admin.id, { role: 'operator' })).rejects.toMatchObject({
      code: 'cannot-change-own-role',
    });
  });

  it('writes nothing when nothing changes', async () => {
    const id = await addUser(t.db, 'operator', 'same@lab.test');
    await users().update(admin, id, { name: 'Test operator' });
    expect(await auditsOf(`user:${id}`)).toEqual([]);
  });
});
