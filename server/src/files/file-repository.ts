import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { FileRow } from './file-tables';

/**
 * Records stored bytes, once per hash: a second record of the same hash returns the first row.
 *
 * @example
 * const row = await recordFile(trx, { sha256, size, mediaType: 'image/tiff', at: clock.now() });
 */
export async function recordFile(
  db: Kysely<Database>,
  file: { sha256: string; size: number; mediaType: string; at: Date },
): Promise<FileRow> {
  await db
    .insertInto('files')
    .values({
      sha256: file.sha256,
      size: file.size,
      media_type: file.mediaType,
      created_at: file.at.toISOString(),
    })
    .onConflict((oc) => oc.column('sha256').doNothing())
    .execute();
  return db.selectFrom('files').selectAll().where('sha256', '=', file.sha256).executeTakeFirstOrThrow();
}

export function findFileById(db: Kysely<Database>, id: number): Promise<FileRow | undefined> {
  return db.selectFrom('files').selectAll().where('id', '=', id).executeTakeFirst();
}

export function findFileBySha(db: Kysely<Database>, sha256: string): Promise<FileRow | undefined> {
  return db.selectFrom('files').selectAll().where('sha256', '=', sha256).executeTakeFirst();
}
