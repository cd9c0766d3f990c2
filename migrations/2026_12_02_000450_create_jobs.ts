import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('jobs')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('kind', 'text', (c) => c.notNull())
    // what the job works on, e.g. roll:12
    .addColumn('target', 'text', (c) => c.notNull())
    .addColumn('state', 'text', (c) =>
      c.notNull().check(sql`state in ('queued', 'running', 'done', 'failed', 'cancelled')`),
    )
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    // JSON: what the job was asked to do
    .addColumn('payload', 'text', (c) => c.notNull().defaultTo('{}'))
    .addColumn('progress_done', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('progress_failed', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('progress_total', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('error', 'text')
    .addColumn('cancel_requested', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('lease_until', 'text')
    .addColumn('created_by', 'integer')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .addColumn('started_at', 'text')
    .addColumn('finished_at', 'text')
    .execute();
  await db.schema.createIndex('jobs_state').on('jobs').columns(['state', 'id']).execute();
  await db.schema.createIndex('jobs_target').on('jobs').column('target').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('jobs').execute();
}
