import { type Kysely } from 'kysely';

// A calibration roll turned into a draft profile: what the operator gave, what was fitted, and the draft it made.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('calibrations')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('stock_id', 'integer', (c) => c.notNull().references('stocks.id'))
    .addColumn('scanner_id', 'integer', (c) => c.references('scanners.id'))
    // JSON: the uploaded frames (file ids, names, sizes, stops), the grey rectangles and the chart's marks
    .addColumn('inputs', 'text', (c) => c.notNull())
    // JSON: γ, curves, speed point, EI, balance and spread, crosstalk, per-patch ΔE00
    .addColumn('fitted', 'text', (c) => c.notNull())
    // JSON: RMS residuals of the curve and crosstalk fits, D
    .addColumn('residuals', 'text', (c) => c.notNull())
    // JSON array of warnings with severity
    .addColumn('warnings', 'text', (c) => c.notNull())
    .addColumn('profile_version_id', 'integer', (c) => c.references('profile_versions.id').unique())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('created_by', 'integer')
    .execute();
  await db.schema.createIndex('calibrations_stock').on('calibrations').column('stock_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('calibrations').execute();
}
