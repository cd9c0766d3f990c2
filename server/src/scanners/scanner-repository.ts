import type {
  CreateScannerRequest,
  Scanner,
  ScannerKind,
  ScannerProfile,
  UpdateScannerRequest,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database, ScannerRow } from '../db/database';

export function listScanners(db: Kysely<Database>): Promise<ScannerRow[]> {
  return db.selectFrom('scanners').selectAll().orderBy('name').execute();
}

export function findScannerById(db: Kysely<Database>, id: number): Promise<ScannerRow | undefined> {
  return db.selectFrom('scanners').selectAll().where('id', '=', id).executeTakeFirst();
}

export function insertScanner(
  db: Kysely<Database>,
  scanner: CreateScannerRequest,
  at: Date,
): Promise<ScannerRow> {
  return db
    .insertInto('scanners')
    .values({
      name: scanner.name,
      kind: scanner.kind,
      input_profile: JSON.stringify(scanner.inputProfile),
      created_at: at.toISOString(),
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Replaces a scanner's name, kind and input profile; undefined when there is no such scanner. */
export function updateScanner(
  db: Kysely<Database>,
  id: number,
  scanner: UpdateScannerRequest,
): Promise<ScannerRow | undefined> {
  return db
    .updateTable('scanners')
    .set({ name: scanner.name, kind: scanner.kind, input_profile: JSON.stringify(scanner.inputProfile) })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirst();
}

export function toScanner(row: ScannerRow): Scanner {
  return {
    id: row.id,
    name: row.name,
    kind: row.kind as ScannerKind,
    inputProfile: JSON.parse(row.input_profile) as ScannerProfile,
    createdAt: row.created_at,
  };
}
