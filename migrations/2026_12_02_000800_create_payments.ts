import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('payments')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('order_id', 'integer', (c) => c.notNull().references('orders.id').onDelete('restrict'))
    .addColumn('checkout_session_id', 'text', (c) => c.notNull().unique())
    .addColumn('amount_minor', 'integer', (c) => c.notNull().check(sql`amount_minor >= 0`))
    .addColumn('currency', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) =>
      c.notNull().check(sql`status in ('open', 'paid', 'declined', 'refunded', 'partly-refunded')`),
    )
    .addColumn('payment_intent_id', 'text')
    .addColumn('refunded_minor', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .addColumn('paid_at', 'text')
    .execute();
  await db.schema.createIndex('payments_order').on('payments').column('order_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('payments').execute();
}
