import type { Kysely } from 'kysely';

// What a customer reads on a stock's sheet: the EI to rate it at, its latitude, push/pull and handling notes, and
// the exponent of its reciprocity correction. Existing stocks get empty notes and the common exponent.
const columns = [
  'recommended_ei',
  'latitude_under_stops',
  'latitude_over_stops',
  'push_pull_notes',
  'reciprocity_exponent',
  'handling_notes',
] as const;

export async function up(db: Kysely<any>): Promise<void> {
  // null: rate at the box speed
  await db.schema.alterTable('stocks').addColumn('recommended_ei', 'integer').execute();
  // null: latitude not stated
  await db.schema.alterTable('stocks').addColumn('latitude_under_stops', 'real').execute();
  await db.schema.alterTable('stocks').addColumn('latitude_over_stops', 'real').execute();
  await db.schema
    .alterTable('stocks')
    .addColumn('push_pull_notes', 'text', (c) => c.notNull().defaultTo(''))
    .execute();
  // p = 1.3 suits many films: common practice of the trade, from memory
  await db.schema
    .alterTable('stocks')
    .addColumn('reciprocity_exponent', 'real', (c) => c.notNull().defaultTo(1.3))
    .execute();
  await db.schema
    .alterTable('stocks')
    .addColumn('handling_notes', 'text', (c) => c.notNull().defaultTo(''))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const column of [...columns].reverse()) {
    await db.schema.alterTable('stocks').dropColumn(column).execute();
  }
}
