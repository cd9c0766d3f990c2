import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertStock } from '../stocks/stock-repository';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { tintedTestStock } from '../test-support/tinted-test-stock';
import { findUserById, toUser } from '../users/user-repository';
import { createProfilesService, type ProfilesService } from './profiles-service';

let t: TestApp;
let profiles: ProfilesService;
let manager: User;
let stockId: number;

const auditOf = (target: string) =>
  t.db
    .selectFrom('audit_log')
    .select(['action', 'actor_id', 'details'])
    .where('target', '=', target)
    .orderBy('id')
    .execute()
    .then((rows) => rows.map((r) => ({ ...r, details: JSON.parse(r.details!) as unknown })));

beforeAll(async () => {
  t = await createTestApp();
  manager = toUser((await findUserById(t.db, await addUser(t.db, 'manager', 'morwen@lab.test')))!);
  stockId = (await insertStock(t.db, { ...tintedTestStock, notes: '' }, t.clock.now())).id;
  profiles = createProfilesService({ db: t.db, clock: t.clock });
});
afterAll(() => t.close());

describe('profiles service', () => {
  it('creates a profile with its version 1 draft and audits both as one change of the profile', async () => {
    const started = await profiles.create(manager, { stockId, scannerId: null, name: 'House' });
    expect(started.version).toMatchObject({ version: 1, status: 'draft', parentVersionId: null });
    expect(started.version.parameters.id).toBe(started.profile.documentId);
    expect(await auditOf(`profile:${started.profile.id}`)).toEqual([
      { action: 'profile-created', actor_id: manager.id, details: { before: null, after: started } },
    ]);
  });

  it('refuses a profile for a stock that does not exist, keeping nothing', async () => {
    await expect(
      profiles.create(manager, { stockId: 999, scannerId: null, name: 'Lost' }),
    ).rejects.toMatchObject({
      status: 404,
      code: 'stock-not-found',
    });
    expect(await t.db.selectFrom('profiles').select('id').where('name', '=', 'Lost').execute()).toEqual([]);
  });

  it('walks a version from draft to published to retired, refusing each step out of order', async () => {
    const { version } = await profiles.create(manager, { stockId, scannerId: null, name: 'Walked' });
    await expect(profiles.retire(manager, version.id)).rejects.toMatchObject({
      code: 'profile-version-not-published',
    });
    const published = await profiles.publish(manager, version.id, 'First cut');
    expect(published).toMatchObject({ status: 'published', changelog: 'First cut', publishedBy: manager.id });
    await expect(profiles.publish(manager, version.id, 'Again')).rejects.toMatchObject({
      code: 'profile-version-not-draft',
    });
    await expect(profiles.updateDraft(manager, version.id, published.parameters)).rejects.toMatchObject({
      code: 'profile-version-immutable',
      status: 409,
    });
    expect((await profiles.retire(manager, version.id)).status).toBe('retired');
    const audit = await auditOf(`profile-version:${version.id}`);
    expect(audit.map((a) => a.action)).toEqual(['profile-version-published', 'profile-version-retired']);
    expect(audit[0]!.details).toMatchObject({ before: { status: 'draft' }, after: { status: 'published' } });
  });

  it('makes a new draft from a published version, numbered next and pointing at its parent', async () => {
    const { profile, version } = await profiles.create(manager, {
      stockId,
      scannerId: null,
      name: 'Branched',
    });
    await profiles.publish(manager, version.id, 'First cut');
    const draft = await profiles.draftFrom(manager, profile.id, version.id);
    expect(draft).toMatchObject({ version: 2, status: 'draft', parentVersionId: version.id });
    expect(await auditOf(`profile-version:${draft.id}`)).toMatchObject([
      { action: 'profile-version-created', details: { before: null, after: { id: draft.id, version: 2 } } },
    ]);
  });

  it('imports a document of a known profile as a new draft, and an unknown one as a new profile', async () => {
    const { profile, version } = await profiles.create(manager, { stockId, scannerId: null, name: 'Shared' });
    const again = await profiles.importDocument(manager, version.parameters);
    expect(again).toMatchObject({ created: 'draft', profile: { id: profile.id } });
    expect(again.version).toMatchObject({ version: 2, parentVersionId: version.id });
    expect(await auditOf(`profile-version:${again.version.id}`)).toEqual([
      { action: 'profile-imported', actor_id: manager.id, details: { before: null, after: again } },
    ]);

    const foreign = await profiles.importDocument(manager, { ...version.parameters, id: 'from-another-lab' });
    expect(foreign).toMatchObject({
      created: 'profile',
      profile: { name: `${tintedTestStock.name} (imported)` },
    });
    expect(foreign.version.version).toBe(1);
    expect(await auditOf(`profile:${foreign.profile.id}`)).toEqual([
      { action: 'profile-imported', actor_id: manager.id, details: { before: null, after: foreign } },
    ]);
  });

  it('refuses a document that is not a profile document, naming each field, and one of an unknown stock', async () => {
    await expect(profiles.importDocument(manager, { schemaVersion: 1 })).rejects.toMatchObject({
      status: 400,
      code: 'profile-document-invalid',
    });
    const { version } = await profiles.create(manager, { stockId, scannerId: null, name: 'Orphan' });
    const unknownStock = {
      ...version.parameters,
      id: 'no-such-stock-here',
      stock: { ...version.parameters.stock, name: 'Nowhere 100' },
    };
    await expect(profiles.importDocument(manager, unknownStock)).rejects.toMatchObject({
      status: 422,
      code: 'stock-not-found',
    });
  });
});
