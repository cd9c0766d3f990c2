import type { Kysely } from 'kysely';

// Each refund of a payment, reserved before the provider is asked and settled by its answer, so what a payment records
// as refunded always equals what the provider refunded. `reason`: 'requested' by staff, or 'surplus' when a payment
// came in for an order already paid.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('payment_refunds')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('payment_id', 'integer', (c) => c.notNull().references('payments.id').onDelete('cascade'))
    .addColumn('amount_minor', 'integer', (c) => c.notNull())
    .addColumn('reason', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull())
    .addColumn('provider_refund_id', 'text')
    .addColumn('failure', 'text')
    .addColumn('requested_by', 'integer', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('payment_refunds_payment').on('payment_refunds').column('payment_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('payment_refunds').execute();
}
