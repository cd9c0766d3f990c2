import type { Kysely } from 'kysely';

// What happens to an order's negatives once developed and scanned: JSON `{"method":"collect"}` or
// `{"method":"post","address":{...}}`. Orders placed before this change are kept at the lab for collection.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('orders')
    .addColumn('negatives', 'text', (c) => c.notNull().defaultTo('{"method":"collect"}'))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('orders').dropColumn('negatives').execute();
}
