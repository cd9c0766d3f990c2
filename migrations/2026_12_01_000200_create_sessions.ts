import type { Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('sessions')
    .addColumn('sid', 'text', (c) => c.primaryKey())
    .addColumn('user_id', 'integer', (c) => c.references('users.id').onDelete('cascade'))
    .addColumn('data', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('sessions_user_id').on('sessions').column('user_id').execute();
  await db.schema.createIndex('sessions_expires_at').on('sessions').column('expires_at').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('sessions').execute();
}
