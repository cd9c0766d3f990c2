import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('profile_versions')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('profile_id', 'integer', (c) => c.notNull().references('profiles.id'))
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().check(sql`status in ('draft', 'published', 'retired')`))
    .addColumn('parent_version_id', 'integer', (c) => c.references('profile_versions.id'))
    // JSON profile document
    .addColumn('parameters', 'text', (c) => c.notNull())
    .addColumn('changelog', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('created_by', 'integer')
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .addColumn('published_at', 'text')
    .addColumn('published_by', 'integer')
    .addColumn('retired_at', 'text')
    .addUniqueConstraint('profile_versions_number', ['profile_id', 'version'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('profile_versions').execute();
}
