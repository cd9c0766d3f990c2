import type { Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('audit_log')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('at', 'text', (c) => c.notNull())
    // no foreign key: the log outlives the accounts it mentions
    .addColumn('actor_id', 'integer')
    .addColumn('actor_email', 'text')
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('target', 'text')
    .addColumn('details', 'text')
    .execute();
  await db.schema.createIndex('audit_log_action_at').on('audit_log').columns(['action', 'at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('audit_log').execute();
}
