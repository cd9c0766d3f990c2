import SQLite from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import type { Database } from './database';

/**
 * Opens (creating if needed) the SQLite file with WAL, foreign keys and a busy timeout.
 *
 * @example
 * const db = openDatabase(join(config.dataDir, 'clearbase.sqlite'));
 */
export function openDatabase(file: string): Kysely<Database> {
  if (file !== ':memory:') mkdirSync(dirname(file), { recursive: true });
  const sqlite = new SQLite(file);
  // WAL lets readers proceed while one writer writes: SQLite documentation, "Write-Ahead Logging"
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  // 5 s: long enough to ride out a checkpoint or a batch write, common practice, from memory
  sqlite.pragma('busy_timeout = 5000');
  // NORMAL is safe with WAL (no corruption, at worst the last commits lost on power failure): SQLite documentation
  sqlite.pragma('synchronous = NORMAL');
  return new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
}
