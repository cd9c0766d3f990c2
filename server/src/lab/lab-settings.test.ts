import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { readLab, writeLab } from './lab-settings';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('the lab settings', () => {
  it('fall back to a neutral name when the stored entry is damaged', async () => {
    await t.db.insertInto('settings').values({ key: 'lab', value: '{"name":' }).execute();
    expect(await readLab(t.db)).toEqual({ name: 'Clearbase', town: '', address: '', payOnCollection: false });
  });

  it('are replaced whole and audited with what they were', async () => {
    const admin = {
      id: await addUser(t.db, 'admin'),
      email: 'admin@lab.test',
      name: 'A',
      role: 'admin' as const,
    };
    const lab = {
      name: 'Northlight Film Lab',
      town: 'Harwick',
      address: '2 Quay Row',
      payOnCollection: true,
    };
    await writeLab(t, admin, lab);
    expect(await readLab(t.db)).toEqual(lab);
    const [audit] = await t.db.selectFrom('audit_log').selectAll().where('target', '=', 'lab').execute();
    expect(JSON.parse(audit!.details!)).toMatchObject({ before: { name: 'Clearbase' }, after: lab });
  });
});
