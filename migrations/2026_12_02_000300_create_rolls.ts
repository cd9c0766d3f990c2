import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('rolls')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('order_id', 'integer', (c) => c.notNull().references('orders.id'))
    .addColumn('stock_id', 'integer', (c) => c.notNull().references('stocks.id'))
    .addColumn('ei', 'integer', (c) => c.notNull())
    .addColumn('push_pull', 'real', (c) => c.notNull().defaultTo(0))
    .addColumn('format', 'text', (c) => c.notNull())
    .addColumn('scanner_id', 'integer', (c) => c.references('scanners.id'))
    // the exact profile version the roll renders with
    .addColumn('profile_version_id', 'integer', (c) => c.notNull().references('profile_versions.id'))
    .addColumn('base_mode', 'text', (c) =>
      c
        .notNull()
        .defaultTo('auto')
        .check(sql`base_mode in ('auto', 'region')`),
    )
    .addColumn('base_frame_id', 'integer')
    // JSON pixel rectangle, JSON measured base
    .addColumn('base_region', 'text')
    .addColumn('base_measured', 'text')
    // JSON adjustments
    .addColumn('adjustments', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .check(sql`status in ('awaiting-scans', 'scanned', 'inverting', 'inverted', 'needs-attention')`),
    )
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('rolls_order').on('rolls').column('order_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('rolls').execute();
}
