import type { Kysely } from 'kysely';

// An order keeps the price list it was placed under (JSON), so a later change of prices does not change what it
// costs; orders placed before this change have none and are priced from the current list, as they were.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('orders').addColumn('price_list', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('orders').dropColumn('price_list').execute();
}
