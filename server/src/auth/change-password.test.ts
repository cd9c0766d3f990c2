import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, testPassword, type TestApp } from '../test-support/test-app';
import { changePassword } from './change-password';
import { verifyPassword } from './password-hash';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

const sessionsOf = (userId: number) =>
  t.db.selectFrom('sessions').select('sid').where('user_id', '=', userId).orderBy('sid').execute();

describe('changing a password', () => {
  it('keeps the asking session, ends the others and audits once', async () => {
    const id = await addUser(t.db, 'operator', 'changer@lab.test');
    for (const sid of ['here', 'phone', 'laptop']) {
      await t.db
        .insertInto('sessions')
        .values({ sid, user_id: id, data: '{}', expires_at: '2099-01-01T00:00:00.000Z' })
        .execute();
    }
    const user = { id, email: 'changer@lab.test', name: 'C', role: 'operator' as const };
    await changePassword(t, user, { currentPassword: testPassword, newPassword: 'a-brand-new-one' }, 'here');
    expect(await sessionsOf(id)).toEqual([{ sid: 'here' }]);
    const row = await t.db
      .selectFrom('users')
      .select('password_hash')
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    expect(await verifyPassword('a-brand-new-one', row.password_hash)).toBe(true);
    const audits = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('target', '=', `user:${id}`)
      .execute();
    expect(audits.map((a) => a.action)).toEqual(['password-changed']);
  });

  it('refuses a wrong current password, naming the field, and changes nothing', async () => {
    const id = await addUser(t.db, 'operator', 'wrong@lab.test');
    const user = { id, email: 'wrong@lab.test', name: 'W', role: 'operator' as const };
    await expect(
      changePassword(t, user, { currentPassword: 'not-it', newPassword: 'a-brand-new-one' }, 'x'),
    ).rejects.toMatchObject({ status: 400, errors: [{ path: 'body.currentPassword' }] });
    const row = await t.db
      .selectFrom('users')
      .select('password_hash')
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    expect(await verifyPassword(testPassword, row.password_hash)).toBe(true);
  });
});
