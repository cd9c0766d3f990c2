import type { Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('download_tokens')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('order_id', 'integer', (c) => c.notNull().references('orders.id').onDelete('cascade'))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .addColumn('created_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('download_tokens_order').on('download_tokens').column('order_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('download_tokens').execute();
}
