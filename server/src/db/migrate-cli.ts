import { join } from 'node:path';
import { ConfigError, loadConfig } from '../config/config';
import { migrateToLatest } from './migrate';
import { openDatabase } from './open-database';
import { databaseFileName } from './database-file';

try {
  const config = loadConfig(process.env);
  const db = openDatabase(join(config.dataDir, databaseFileName));
  const applied = await migrateToLatest(db);
  console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'The database is up to date.');
  await db.destroy();
} catch (err) {
  console.error(err instanceof ConfigError ? err.message : `Migration failed: ${(err as Error).message}`);
  process.exit(1);
}
