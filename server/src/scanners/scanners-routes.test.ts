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

const flatbed = {
  name: 'Sheet flatbed',
  kind: 'flatbed',
  inputProfile: {
    name: 'Sheet flatbed',
    encoding: 'gamma',
    gamma: 2.2,
    blackLevel: [0.01, 0.01, 0.012],
    gains: [1, 1.02, 1.08],
  },
};

async function addScanner(name: string): Promise<number> {
  const res = await manager.post('/api/scanners', { ...flatbed, name });
  expect(res.status).toBe(201);
  return res.body.scanner.id as number;
}

describe('changing a scanner', () => {
  it('lets a manager change the encoding, black level and gains, and audits before and after', async () => {
    const id = await addScanner('Bench flatbed');
    const change = {
      name: 'Bench flatbed',
      kind: 'flatbed',
      inputProfile: {
        name: 'Bench flatbed',
        encoding: 'srgb',
        gamma: 1,
        blackLevel: [0.002, 0.002, 0.003],
        gains: [1.05, 1, 1.1],
      },
    };
    const res = await manager.patch(`/api/scanners/${id}`, change);
    expect(res.status).toBe(200);
    expect(res.body.scanner).toMatchObject({ id, ...change });
    const list = await operator.get('/api/scanners');
    expect(list.body.scanners.find((s: { id: number }) => s.id === id)).toMatchObject(change);

    const audit = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'scanner-updated')
      .executeTakeFirstOrThrow();
    expect(audit.target).toBe(`scanner:${id}`);
    expect(JSON.parse(audit.details!)).toMatchObject({
      before: { inputProfile: { encoding: 'gamma' } },
      after: { inputProfile: { encoding: 'srgb' } },
    });
  });

  it('refuses operators and customers (403)', async () => {
    const id = await addScanner('Not for operators');
    expect((await operator.patch(`/api/scanners/${id}`, flatbed)).status).toBe(403);
    expect((await customer.patch(`/api/scanners/${id}`, flatbed)).status).toBe(403);
  });

  it('answers 404 for an unknown scanner and 409 with the name field for a taken name', async () => {
    expect((await manager.patch('/api/scanners/9999', flatbed)).status).toBe(404);
    await addScanner('Taken name');
    const id = await addScanner('Renamed later');
    const res = await manager.patch(`/api/scanners/${id}`, { ...flatbed, name: 'Taken name' });
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.body.errors).toEqual([{ path: 'body.name', message: expect.any(String) }]);
  });

  it('names each invalid field of the input profile', async () => {
    const id = await addScanner('Validated');
    const res = await manager.patch(`/api/scanners/${id}`, {
      ...flatbed,
      inputProfile: { ...flatbed.inputProfile, blackLevel: [0.9, 0, 0], gamma: 0 },
    });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
      'body.inputProfile.blackLevel.0',
      'body.inputProfile.gamma',
    ]);
  });
});
