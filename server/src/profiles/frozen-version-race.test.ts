import type { ProfileDocument } from '@clearbase/contracts';
import type {
  KyselyPlugin,
  PluginTransformQueryArgs,
  PluginTransformResultArgs,
  QueryResult,
  RootOperationNode,
  UnknownRow,
} from 'kysely';
import { join } from 'node:path';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../app';
import { AppError } from '../errors/app-error';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { defaultProfileDocument } from './default-profile-document';
import {
  findVersionById,
  insertDraft,
  insertProfile,
  isFrozenVersionViolation,
  updateDraftParameters,
  updateVersionStatus,
} from './profile-repository';
import { insertStock } from '../stocks/stock-repository';

/**
 * Makes every version read look like a draft while `on`: the request then sees what a request that read just
 * before another one published the version would see, and only the database trigger stands in its way.
 */
class StaleDraftReads implements KyselyPlugin {
  on = false;
  transformQuery(args: PluginTransformQueryArgs): RootOperationNode {
    return args.node;
  }
  async transformResult(args: PluginTransformResultArgs): Promise<QueryResult<UnknownRow>> {
    if (!this.on) return args.result;
    const rows = args.result.rows.map((r) =>
      'status' in r && 'parameters' in r ? { ...r, status: 'draft' } : r,
    );
    return { ...args.result, rows };
  }
}

let t: TestApp;
let stale: StaleDraftReads;
let manager: Client;
let operator: Client;
let publishedId: number;
let parameters: ProfileDocument;

beforeAll(async () => {
  t = await createTestApp();
  await addUser(t.db, 'manager');
  await addUser(t.db, 'operator');
  const at = t.clock.now();
  const stock = await insertStock(
    t.db,
    {
      name: 'Racing 200',
      maker: 'Harrowgate Emulsions',
      iso: 200,
      process: 'C-41',
      masked: false,
      baseMaterial: 'clear polyester',
      frameFormats: ['135-36'],
      notes: '',
    },
    at,
  );
  const profile = await insertProfile(t.db, {
    stockId: stock.id,
    scannerId: null,
    name: 'House',
    documentId: 'race-doc',
    at,
    by: null,
  });
  parameters = defaultProfileDocument(stock, 'race-doc');
  const draft = await insertDraft(t.db, { profile, parentVersionId: null, parameters, at, by: null });
  await updateVersionStatus(t.db, draft.id, {
    status: 'published',
    changelog: 'First release',
    published_at: at.toISOString(),
  });
  publishedId = draft.id;

  stale = new StaleDraftReads();
  const app = createApp({
    db: t.db.withPlugin(stale),
    config: t.config,
    clock: t.clock,
    logger: pino({ level: 'silent' }),
    webRoot: join(t.config.dataDir, 'no-web'),
  });
  manager = await signedIn(app, 'manager@lab.test');
  operator = await signedIn(app, 'operator@lab.test');
});
afterAll(() => t.close());

describe('a version published between a request’s read and its write', () => {
  it('is recognised by the trigger’s message', async () => {
    const err = await t.db
      .updateTable('profile_versions')
      .set({ parameters: '{}' })
      .where('id', '=', publishedId)
      .execute()
      .catch((e: unknown) => e);
    expect(isFrozenVersionViolation(err)).toBe(true);
    expect(isFrozenVersionViolation(new Error('disk I/O error'))).toBe(false);
  });

  it('makes the repository throw a 409 AppError and leaves the parameters as they were', async () => {
    const before = (await findVersionById(t.db, publishedId))!.parameters;
    const changed = { ...parameters, saturation: 1.4 };
    const err = await updateDraftParameters(t.db, publishedId, changed, t.clock.now()).catch(
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(AppError);
    expect(err).toMatchObject({ status: 409, code: 'profile-version-immutable' });
    expect((await findVersionById(t.db, publishedId))!.parameters).toBe(before);
  });

  it('answers a PATCH that read a stale draft with a 409 problem, not a 500', async () => {
    stale.on = true;
    const res = await operator.patch(`/api/profile-versions/${publishedId}`, {
      parameters: { ...parameters, saturation: 1.4 },
    });
    stale.on = false;
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.body).toMatchObject({ status: 409, code: 'profile-version-immutable' });
    const row = (await findVersionById(t.db, publishedId))!;
    expect((JSON.parse(row.parameters) as ProfileDocument).saturation).toBe(parameters.saturation);
  });

  it('answers a second publish that read a stale draft with a 409 problem and keeps the first changelog', async () => {
    stale.on = true;
    const res = await manager.post(`/api/profile-versions/${publishedId}/publish`, {
      changelog: 'Published twice',
    });
    stale.on = false;
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect((await findVersionById(t.db, publishedId))!.changelog).toBe('First release');
  });
});
