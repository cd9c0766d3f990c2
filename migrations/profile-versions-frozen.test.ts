import { sql } from 'kysely';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrateToLatest } from '../server/src/db/migrate';
import { openDatabase } from '../server/src/db/open-database';

const dir = mkdtempSync(join(tmpdir(), 'clearbase-frozen-'));
const db = openDatabase(join(dir, 'frozen.sqlite'));
beforeAll(async () => {
  await migrateToLatest(db);
  await sql`insert into stocks (name, maker, iso, process, masked, base_material, frame_formats, created_at)
    values ('Test stock', 'Test maker', 200, 'C-41', 0, 'clear polyester', '["135"]', '2026-01-01T00:00:00Z')`.execute(
    db,
  );
  await sql`insert into profiles (stock_id, name, document_id, created_at) values (1, 'Test', 'test-doc', '2026-01-01T00:00:00Z')`.execute(
    db,
  );
  for (const [version, status] of [
    [1, 'published'],
    [2, 'draft'],
    [3, 'retired'],
  ] as const) {
    await sql`insert into profile_versions (profile_id, version, status, parameters, created_at, updated_at)
      values (1, ${version}, ${status}, '{"a":1}', '2026-01-01T00:00:00Z', '2026-01-01T00:00:00Z')`.execute(
      db,
    );
  }
});
afterAll(async () => {
  await db.destroy();
  rmSync(dir, { recursive: true, force: true });
});

const parametersOf = async (version: number) =>
  (
    await sql<{
      parameters: string;
    }>`select parameters from profile_versions where version = ${version}`.execute(db)
  ).rows[0]!.parameters;

describe('profile versions in the database', () => {
  it('refuse a direct UPDATE of a published version’s parameters and keep them', async () => {
    await expect(
      sql`update profile_versions set parameters = '{"a":2}' where version = 1`.execute(db),
    ).rejects.toThrow(/immutable/);
    expect(await parametersOf(1)).toBe('{"a":1}');
  });

  it('refuse an UPDATE of a retired version’s parameters', async () => {
    await expect(
      sql`update profile_versions set parameters = '{"a":2}' where version = 3`.execute(db),
    ).rejects.toThrow(/immutable/);
  });

  it('refuse rewriting a published version’s changelog or publisher', async () => {
    await expect(
      sql`update profile_versions set changelog = 'rewritten' where version = 1`.execute(db),
    ).rejects.toThrow(/immutable/);
    await expect(
      sql`update profile_versions set published_by = 7 where version = 1`.execute(db),
    ).rejects.toThrow(/immutable/);
  });

  it('let a draft’s parameters change', async () => {
    await sql`update profile_versions set parameters = '{"a":2}' where version = 2`.execute(db);
    expect(await parametersOf(2)).toBe('{"a":2}');
  });

  it('move only forward from draft to published to retired', async () => {
    await expect(
      sql`update profile_versions set status = 'draft' where version = 1`.execute(db),
    ).rejects.toThrow(/only from draft/);
    await expect(
      sql`update profile_versions set status = 'published' where version = 3`.execute(db),
    ).rejects.toThrow(/only from draft/);
    await expect(
      sql`update profile_versions set status = 'retired' where version = 2`.execute(db),
    ).rejects.toThrow(/only from draft/);
    await sql`update profile_versions set status = 'retired' where version = 1`.execute(db);
  });
});
