import type { CreateScannerRequest, User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createScannersService } from './scanners-service';

let t: TestApp;
let manager: User;
beforeAll(async () => {
  t = await createTestApp();
  manager = { id: await addUser(t.db, 'manager'), email: 'manager@lab.test', name: 'M', role: 'manager' };
});
afterAll(() => t.close());

const flatbed = (name: string): CreateScannerRequest => ({
  name,
  kind: 'flatbed',
  inputProfile: {
    name,
    encoding: 'gamma',
    gamma: 2.2,
    blackLevel: [0.01, 0.01, 0.012],
    gains: [1, 1.02, 1.08],
  },
});

describe('the scanners service', () => {
  it('audits a change with the scanner before and after', async () => {
    const scanners = createScannersService({ db: t.db, clock: t.clock });
    const created = await scanners.create(manager, flatbed('Bench flatbed'));
    const updated = await scanners.update(manager, created.id, {
      ...flatbed('Bench flatbed'),
      kind: 'lab-scanner',
    });
    const audit = await t.db
      .selectFrom('audit_log')
      .select(['action', 'details'])
      .where('target', '=', `scanner:${created.id}`)
      .orderBy('id')
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['scanner-created', 'scanner-updated']);
    expect(JSON.parse(audit[1]!.details!)).toMatchObject({ before: created, after: updated });
  });

  it('names the field when another scanner has the name, and leaves both unchanged', async () => {
    const scanners = createScannersService({ db: t.db, clock: t.clock });
    await scanners.create(manager, flatbed('First'));
    const second = await scanners.create(manager, flatbed('Second'));
    await expect(scanners.update(manager, second.id, flatbed('First'))).rejects.toMatchObject({
      status: 409,
      code: 'scanner-name-taken',
      errors: [{ path: 'body.name', message: 'Another scanner has this name' }],
    });
    expect((await scanners.list()).map((s) => s.name).sort()).toEqual(['Bench flatbed', 'First', 'Second']);
  });
});
