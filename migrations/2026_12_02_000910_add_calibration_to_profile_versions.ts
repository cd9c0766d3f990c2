import { type Kysely } from 'kysely';

// The calibration a draft was fitted from, the other half of calibrations.profile_version_id. No foreign key:
// SQLite cannot drop a column that takes part in one, and `down` must be able to.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('profile_versions').addColumn('calibration_id', 'integer').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('profile_versions').dropColumn('calibration_id').execute();
}
