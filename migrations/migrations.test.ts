import { sql } from 'kysely';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { migrateAllDown, migrateToLatest } from '../server/src/db/migrate';
import { openDatabase } from '../server/src/db/open-database';

const dir = mkdtempSync(join(tmpdir(), 'clearbase-migrations-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function tableNames(db: ReturnType<typeof openDatabase>): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`
    select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'kysely_%'
    order by name`.execute(db);
  return rows.map((r) => r.name);
}

describe('migrations', () => {
  it('migrate a fresh database up to the latest version and all the way down again', async () => {
    const db = openDatabase(join(dir, 'up-down.sqlite'));
    const applied = await migrateToLatest(db);
    expect(applied.length).toBeGreaterThanOrEqual(4);
    expect(await tableNames(db)).toEqual(
      expect.arrayContaining(['audit_log', 'sessions', 'settings', 'users']),
    );

    expect(await migrateToLatest(db)).toEqual([]);

    const undone = await migrateAllDown(db);
    expect(undone).toEqual([...applied].reverse());
    expect(await tableNames(db)).toEqual([]);
    await db.destroy();
  });

  it('name every migration file by date, time and what it does', async () => {
    const { readdirSync } = await import('node:fs');
    const files = readdirSync(new URL('.', import.meta.url)).filter((f) => !f.endsWith('.test.ts'));
    for (const f of files) expect(f).toMatch(/^\d{4}_\d{2}_\d{2}_\d{6}_[a-z0-9_]+\.ts$/);
  });
});
