import type { Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('profiles')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('stock_id', 'integer', (c) => c.notNull().references('stocks.id'))
    .addColumn('scanner_id', 'integer', (c) => c.references('scanners.id'))
    .addColumn('name', 'text', (c) => c.notNull())
    // the id the exported profile document carries, so an import can find its profile again
    .addColumn('document_id', 'text', (c) => c.notNull().unique())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('created_by', 'integer')
    .execute();
  await db.schema.createIndex('profiles_stock').on('profiles').column('stock_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('profiles').execute();
}
