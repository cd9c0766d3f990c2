import {
  Migrator,
  NO_MIGRATIONS,
  type Kysely,
  type Migration,
  type MigrationProvider,
  type MigrationResultSet,
} from 'kysely';
import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

/** The migrations folder at the repository root. */
export const migrationsFolder = fileURLToPath(new URL('../../../migrations', import.meta.url));

/** migrations/YYYY_MM_DD_HHMMSS_what_it_does.ts; tests and other files in the folder are ignored. */
const migrationFileName = /^\d{4}_\d{2}_\d{2}_\d{6}_[a-z0-9_]+\.ts$/;

/** Loads migrations with plain dynamic import, which works the same under tsx and vitest. */
export function folderMigrationProvider(folder: string = migrationsFolder): MigrationProvider {
  return {
    async getMigrations() {
      const files = (await readdir(folder)).filter((f) => migrationFileName.test(f)).sort();
      const migrations: Record<string, Migration> = {};
      for (const file of files) {
        const mod = (await import(pathToFileURL(join(folder, file)).href)) as Migration;
        migrations[file.replace(/\.ts$/, '')] = { up: mod.up, down: mod.down };
      }
      return migrations;
    },
  };
}

export function createMigrator(db: Kysely<any>, folder?: string): Migrator {
  return new Migrator({ db, provider: folderMigrationProvider(folder) });
}

function check(result: MigrationResultSet): string[] {
  if (result.error) {
    const failed = result.results?.find((r) => r.status === 'Error');
    const what = failed ? `migration ${failed.migrationName} failed` : 'migrating failed';
    throw new Error(
      `${what}: ${result.error instanceof Error ? result.error.message : String(result.error)}`,
      {
        cause: result.error,
      },
    );
  }
  return (result.results ?? []).map((r) => r.migrationName);
}

/** Migrates to the latest version; throws naming the failed migration. Returns the names applied. */
export async function migrateToLatest(db: Kysely<any>, folder?: string): Promise<string[]> {
  return check(await createMigrator(db, folder).migrateToLatest());
}

/** Undoes every migration (for tests and for starting over). Returns the names undone. */
export async function migrateAllDown(db: Kysely<any>, folder?: string): Promise<string[]> {
  const migrator = createMigrator(db, folder);
  return check(await migrator.migrateTo(NO_MIGRATIONS));
}
