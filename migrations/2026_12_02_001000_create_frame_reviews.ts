import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('frame_reviews')
    // one review per frame: the latest decision replaces the one before (the audit log keeps the history)
    .addColumn('frame_id', 'integer', (c) => c.primaryKey().references('frames.id'))
    .addColumn('decision', 'text', (c) =>
      c.notNull().check(sql`decision in ('approved', 'rejected', 'excluded')`),
    )
    .addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('reviewed_by', 'integer', (c) => c.notNull().references('users.id'))
    .addColumn('reviewed_at', 'text', (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('frame_reviews').execute();
}
