import { type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('files')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    // hex SHA-256 of the bytes; the file lives at files/<first two>/<rest>
    .addColumn('sha256', 'text', (c) => c.notNull().unique())
    .addColumn('size', 'integer', (c) => c.notNull())
    .addColumn('media_type', 'text', (c) => c.notNull())
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('files').execute();
}
