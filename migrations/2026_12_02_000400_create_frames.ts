import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('frames')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('roll_id', 'integer', (c) => c.notNull().references('rolls.id'))
    .addColumn('frame_index', 'integer', (c) => c.notNull())
    .addColumn('source_file_id', 'integer', (c) => c.notNull().references('files.id'))
    .addColumn('file_name', 'text', (c) => c.notNull())
    .addColumn('width', 'integer', (c) => c.notNull())
    .addColumn('height', 'integer', (c) => c.notNull())
    .addColumn('bit_depth', 'integer', (c) => c.notNull().check(sql`bit_depth in (8, 16)`))
    .addColumn('base_mode', 'text', (c) =>
      c
        .notNull()
        .defaultTo('auto')
        .check(sql`base_mode in ('auto', 'region')`),
    )
    // JSON pixel rectangle
    .addColumn('base_region', 'text')
    .addColumn('base_source', 'text')
    // JSON measured base
    .addColumn('base_measured', 'text')
    // JSON adjustments
    .addColumn('adjustments', 'text', (c) => c.notNull())
    .addColumn('status', 'text', (c) =>
      c.notNull().check(sql`status in ('queued', 'inverting', 'done', 'failed')`),
    )
    // JSON arrays of QC flags and of warnings
    .addColumn('qc_flags', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('warnings', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('error', 'text')
    .addColumn('rendered_at', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addUniqueConstraint('frames_index', ['roll_id', 'frame_index'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('frames').execute();
}
