import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('frame_outputs')
    .addColumn('frame_id', 'integer', (c) => c.notNull().references('frames.id'))
    .addColumn('kind', 'text', (c) =>
      c.notNull().check(sql`kind in ('preview', 'negative-preview', 'jpeg', 'tiff16', 'png16')`),
    )
    .addColumn('file_id', 'integer', (c) => c.notNull().references('files.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addPrimaryKeyConstraint('frame_outputs_key', ['frame_id', 'kind'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('frame_outputs').execute();
}
