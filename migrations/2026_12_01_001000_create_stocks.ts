import type { Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('stocks')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('name', 'text', (c) => c.notNull().unique())
    .addColumn('maker', 'text', (c) => c.notNull())
    .addColumn('iso', 'integer', (c) => c.notNull())
    .addColumn('process', 'text', (c) => c.notNull())
    // 0/1: SQLite has no boolean type
    .addColumn('masked', 'integer', (c) => c.notNull())
    .addColumn('base_material', 'text', (c) => c.notNull())
    // JSON array of frame format names
    .addColumn('frame_formats', 'text', (c) => c.notNull())
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('stocks').execute();
}
