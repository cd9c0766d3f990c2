import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeRegistryOf } from '../app';
import { createTestApp, signedIn, addUser, type TestApp } from '../test-support/test-app';
import { profileUploadLimitBytes } from './profile-upload';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

const operators = ['operator', 'manager', 'admin'];
const managers = ['manager', 'admin'];

describe('catalogue and profile routes', () => {
  it('declare who may call them: reads for staff or anyone signed in, publishing and retiring for managers', () => {
    const roles = Object.fromEntries(
      routeRegistryOf(t.app).map((r) => [`${r.method.toUpperCase()} ${r.path}`, r.roles]),
    );
    expect(roles).toMatchObject({
      'GET /api/stocks': 'signed-in',
      'POST /api/stocks': managers,
      'GET /api/stocks/:id': 'signed-in',
      'GET /api/scanners': operators,
      'POST /api/scanners': managers,
      'POST /api/profiles': operators,
      'POST /api/profiles/import': operators,
      'POST /api/profiles/:id/versions': operators,
      'GET /api/profile-versions/:id': operators,
      'PATCH /api/profile-versions/:id': operators,
      'POST /api/profile-versions/:id/publish': managers,
      'POST /api/profile-versions/:id/retire': managers,
      'GET /api/profile-versions/:a/diff/:b': operators,
      'GET /api/profile-versions/:id/export': operators,
    });
  });

  it('refuse an imported file above the upload limit with a 413 problem', async () => {
    await addUser(t.db, 'operator');
    const operator = await signedIn(t.app, 'operator@lab.test');
    const res = await operator.agent
      .post('/api/profiles/import')
      .set('X-XSRF-TOKEN', operator.token)
      .attach('file', Buffer.alloc(profileUploadLimitBytes + 1, 32), { filename: 'big.json' });
    expect(res.status).toBe(413);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
  });
});
