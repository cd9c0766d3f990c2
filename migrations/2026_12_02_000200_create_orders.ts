import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('orders')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('customer_id', 'integer', (c) => c.notNull().references('users.id'))
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .check(
          sql`status in ('received', 'developing', 'scanning', 'tuning', 'ready', 'delivered', 'cancelled')`,
        ),
    )
    .addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
    // JSON array of output formats
    .addColumn('output_formats', 'text', (c) => c.notNull())
    .addColumn('scan_size', 'text', (c) => c.notNull())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('orders_customer').on('orders').column('customer_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('orders').execute();
}
