import type { ProfileDocument } from '@clearbase/contracts';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signInRoles } from '../test-support/sign-in-roles';
import { tintedTestStock } from '../test-support/tinted-test-stock';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';

let t: TestApp;
let manager: Client;
let operator: Client;
let customer: Client;
let stockId: number;
beforeAll(async () => {
  t = await createTestApp();
  ({ manager, operator, customer } = await signInRoles(t, ['manager', 'operator', 'customer']));
  const stock = await manager.post('/api/stocks', tintedTestStock);
  stockId = stock.body.stock.id;
});
afterAll(() => t.close());

async function newProfile(name: string) {
  const res = await operator.post('/api/profiles', { stockId, name });
  expect(res.status).toBe(201);
  return res.body as {
    profile: { id: number; documentId: string };
    version: { id: number; version: number; parameters: ProfileDocument };
  };
}

async function publish(versionId: number) {
  const res = await manager.post(`/api/profile-versions/${versionId}/publish`, {
    changelog: 'First balanced release',
  });
  expect(res.status).toBe(200);
  return res.body.version;
}

describe('profiles and their versions', () => {
  it('lets an operator create a profile whose version 1 is a draft labelled with the profile and stock', async () => {
    const { profile, version } = await newProfile('Glasswing on the copy stand');
    expect(version).toMatchObject({ version: 1, status: 'draft', parentVersionId: null });
    expect(version.parameters).toMatchObject({
      id: profile.documentId,
      version: 1,
      stock: { name: 'Glasswing 400', base: 'tinted', iso: 400 },
    });
    const page = await customer.get(`/api/stocks/${stockId}`);
    expect(page.body.profiles.find((p: { id: number }) => p.id === profile.id).versions).toHaveLength(1);
  });

  it('lets an operator edit a draft, and only a manager publish it with a changelog', async () => {
    const { version } = await newProfile('Edited');
    const parameters = { ...version.parameters, balance: { cyanRed: 0, magentaGreen: -4, yellowBlue: 2 } };
    const edited = await operator.patch(`/api/profile-versions/${version.id}`, { parameters });
    expect(edited.status).toBe(200);
    expect(edited.body.version.parameters.balance.magentaGreen).toBe(-4);

    expect(
      (await operator.post(`/api/profile-versions/${version.id}/publish`, { changelog: 'x' })).status,
    ).toBe(403);
    const noLine = await manager.post(`/api/profile-versions/${version.id}/publish`, {});
    expect(noLine.status).toBe(400);
    expect(noLine.body.errors[0].path).toBe('body.changelog');
    const published = await publish(version.id);
    expect(published).toMatchObject({
      status: 'published',
      changelog: 'First balanced release',
      publishedAt: expect.any(String),
    });
  });

  it('answers 409 to a PATCH of a published version and changes nothing', async () => {
    const { version } = await newProfile('Frozen');
    await publish(version.id);
    const before = await t.db
      .selectFrom('profile_versions')
      .selectAll()
      .where('id', '=', version.id)
      .executeTakeFirstOrThrow();
    const res = await operator.patch(`/api/profile-versions/${version.id}`, {
      parameters: { ...version.parameters, saturation: 2 },
    });
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    const after = await t.db
      .selectFrom('profile_versions')
      .selectAll()
      .where('id', '=', version.id)
      .executeTakeFirstOrThrow();
    expect(after).toEqual(before);
  });

  it('refuses a direct UPDATE of a published version’s parameters in the database', async () => {
    const { version } = await newProfile('Frozen in SQL');
    await publish(version.id);
    await expect(
      sql`update profile_versions set parameters = '{}' where id = ${version.id}`.execute(t.db),
    ).rejects.toThrow(/immutable/);
  });

  it('makes a new draft from any version, numbered max+1 with its parent recorded', async () => {
    const { profile, version: v1 } = await newProfile('Branching');
    await publish(v1.id);
    const v2 = (await operator.post(`/api/profiles/${profile.id}/versions`, { parentVersionId: v1.id })).body
      .version;
    const v3 = await operator.post(`/api/profiles/${profile.id}/versions`, { parentVersionId: v1.id });
    expect(v3.status).toBe(201);
    expect(v3.body.version).toMatchObject({ version: 3, status: 'draft', parentVersionId: v1.id });
    expect(v3.body.version.parameters).toEqual({ ...v1.parameters, version: 3 });
    expect(v2.version).toBe(2);
    const foreign = await newProfile('Elsewhere');
    expect(
      (await operator.post(`/api/profiles/${profile.id}/versions`, { parentVersionId: foreign.version.id }))
        .status,
    ).toBe(404);
  });

  it('retires a published version, which stays readable, and moves no further', async () => {
    const { version } = await newProfile('Retiring');
    expect((await manager.post(`/api/profile-versions/${version.id}/retire`)).status).toBe(409);
    await publish(version.id);
    expect((await operator.post(`/api/profile-versions/${version.id}/retire`)).status).toBe(403);
    const retired = await manager.post(`/api/profile-versions/${version.id}/retire`);
    expect(retired.body.version).toMatchObject({ status: 'retired', retiredAt: expect.any(String) });
    expect((await operator.get(`/api/profile-versions/${version.id}`)).body.version.parameters).toEqual(
      version.parameters,
    );
    expect(
      (await manager.post(`/api/profile-versions/${version.id}/publish`, { changelog: 'again' })).status,
    ).toBe(409);
  });

  it('keeps customers away from versions, exports and diffs', async () => {
    const { version } = await newProfile('Private');
    expect((await customer.get(`/api/profile-versions/${version.id}`)).status).toBe(403);
    expect((await customer.get(`/api/profile-versions/${version.id}/export`)).status).toBe(403);
    expect((await customer.get(`/api/profile-versions/${version.id}/diff/${version.id}`)).status).toBe(403);
    expect((await customer.post('/api/profiles', { stockId, name: 'No' })).status).toBe(403);
  });
});

describe('diff', () => {
  it('lists each changed parameter with before and after, leaving out the version labels', async () => {
    const { profile, version: v1 } = await newProfile('Diffed');
    const v2 = (await operator.post(`/api/profiles/${profile.id}/versions`, { parentVersionId: v1.id })).body
      .version;
    const parameters = structuredClone(v2.parameters);
    parameters.balance.magentaGreen = -3;
    parameters.crosstalk[0][1] = -0.04;
    parameters.curves.green.points[1].density = 1.7;
    await operator.patch(`/api/profile-versions/${v2.id}`, { parameters });
    const res = await operator.get(`/api/profile-versions/${v1.id}/diff/${v2.id}`);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      from: v1.id,
      to: v2.id,
      changes: [
        { path: 'curves.green.points[1].density', before: 1.8, after: 1.7 },
        { path: 'crosstalk[0][1]', before: 0, after: -0.04 },
        { path: 'balance.magentaGreen', before: 0, after: -3 },
      ],
    });
    expect((await operator.get(`/api/profile-versions/${v1.id}/diff/99999`)).status).toBe(404);
  });
});

describe('export and import', () => {
  it('exports a version as a JSON attachment holding its profile document', async () => {
    const { version } = await newProfile('Exported');
    const res = await operator.get(`/api/profile-versions/${version.id}/export`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?profile-.+-v1\.json"?$/);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    expect(JSON.parse(res.text)).toEqual(version.parameters);
  });

  it('imports an exported document into another lab as a new profile whose export is the same document', async () => {
    const { version } = await newProfile('Travelling');
    const exported = JSON.parse((await operator.get(`/api/profile-versions/${version.id}/export`)).text);

    const other = await createTestApp();
    try {
      await addUser(other.db, 'manager', 'm@other.test');
      const m = await signedIn(other.app, 'm@other.test');
      await m.post('/api/stocks', {
        name: 'Glasswing 400',
        maker: 'Harrowgate Emulsions',
        iso: 400,
        process: 'C-41',
        masked: false,
        baseMaterial: 'tinted polyester',
        frameFormats: ['120'],
      });
      const imported = await m.post('/api/profiles/import', exported);
      expect(imported.status).toBe(201);
      expect(imported.body.created).toBe('profile');
      const again = JSON.parse(
        (await m.get(`/api/profile-versions/${imported.body.version.id}/export`)).text,
      );
      expect(again).toEqual(exported);
    } finally {
      await other.close();
    }
  });

  it('imports a document of a known profile as a new draft, never overwriting, from a multipart file', async () => {
    const { profile, version: v1 } = await newProfile('Reimported');
    await publish(v1.id);
    const exported = JSON.parse((await operator.get(`/api/profile-versions/${v1.id}/export`)).text);
    exported.saturation = 1.1;
    const res = await operator.agent
      .post('/api/profiles/import')
      .set('X-XSRF-TOKEN', operator.token)
      .attach('file', Buffer.from(JSON.stringify(exported)), {
        filename: 'profile.json',
        contentType: 'application/json',
      });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      created: 'draft',
      profile: { id: profile.id },
      version: { version: 2, status: 'draft', parentVersionId: v1.id },
    });
    expect(res.body.version.parameters).toEqual({ ...exported, version: 2 });
    const original = (await operator.get(`/api/profile-versions/${v1.id}`)).body.version;
    expect(original.parameters.saturation).toBe(1);
  });

  it('answers each schema error of an imported document with its path', async () => {
    const { version } = await newProfile('Broken');
    const { tone: _tone, ...broken } = structuredClone(version.parameters);
    broken.curves.red.points[1]!.density = -1;
    broken.saturation = 9;
    const res = await operator.post('/api/profiles/import', broken);
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
      'curves.red.points[1].density',
      'saturation',
      'tone',
    ]);
    for (const e of res.body.errors) expect(e.message).toEqual(expect.any(String));
  });

  it('refuses a file that is not JSON, and a document for a stock the lab does not have', async () => {
    const notJson = await operator.agent
      .post('/api/profiles/import')
      .set('X-XSRF-TOKEN', operator.token)
      .attach('file', Buffer.from('not json'), { filename: 'p.json' });
    expect(notJson.status).toBe(400);
    const { version } = await newProfile('Unknown stock');
    const doc = {
      ...version.parameters,
      id: 'never-seen',
      stock: { ...version.parameters.stock, name: 'Nowhere 50' },
    };
    const res = await operator.post('/api/profiles/import', doc);
    expect(res.status).toBe(422);
    expect(res.body.errors[0].path).toBe('stock.name');
  });
});

describe('audit', () => {
  it('records each change with who, when, and before and after', async () => {
    const { version } = await newProfile('Audited');
    const parameters = { ...version.parameters, saturation: 1.2 };
    await operator.patch(`/api/profile-versions/${version.id}`, { parameters });
    await publish(version.id);
    await manager.post(`/api/profile-versions/${version.id}/retire`);
    const rows = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('target', '=', `profile-version:${version.id}`)
      .orderBy('id')
      .execute();
    expect(rows.map((r) => [r.action, r.actor_email])).toEqual([
      ['profile-version-updated', 'operator@lab.test'],
      ['profile-version-published', 'manager@lab.test'],
      ['profile-version-retired', 'manager@lab.test'],
    ]);
    const updated = JSON.parse(rows[0]!.details!);
    expect(updated.before.saturation).toBe(1);
    expect(updated.after.saturation).toBe(1.2);
    expect(JSON.parse(rows[1]!.details!)).toMatchObject({
      before: { status: 'draft' },
      after: { status: 'published', changelog: 'First balanced release' },
    });
    expect(rows.every((r) => r.at === '2026-03-02T09:00:00.000Z')).toBe(true);
    const created = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('action', '=', 'profile-created')
      .execute();
    expect(created.length).toBeGreaterThan(0);
  });
});
