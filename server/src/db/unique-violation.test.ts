import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { isUniqueViolation } from './unique-violation';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('unique violation', () => {
  it('recognises the error SQLite raises for a second account with the same e-mail address', async () => {
    await addUser(t.db, 'operator', 'twice@lab.test');
    const err = await addUser(t.db, 'operator', 'twice@lab.test').catch((e: unknown) => e);
    expect(isUniqueViolation(err)).toBe(true);
  });

  it('does not take a primary key clash, other errors, or things that are not errors, for one', async () => {
    const setting = () => t.db.insertInto('settings').values({ key: 'lab', value: '{}' }).execute();
    await setting();
    const clash = await setting().catch((e: unknown) => e);
    expect(clash).toMatchObject({ code: 'SQLITE_CONSTRAINT_PRIMARYKEY' });
    expect(isUniqueViolation(clash)).toBe(false);
    expect(isUniqueViolation(new Error('SQLITE_CONSTRAINT_UNIQUE'))).toBe(false);
    expect(isUniqueViolation(null)).toBe(false);
    expect(isUniqueViolation('SQLITE_CONSTRAINT_UNIQUE')).toBe(false);
  });
});
