import { sql, type Kysely } from 'kysely';

// A published or retired version is what rolls were rendered with: its parameters, number and profile never change.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create trigger profile_versions_frozen
    before update of parameters, version, profile_id, parent_version_id on profile_versions
    when old.status <> 'draft'
    begin
      select raise(abort, 'published profile versions are immutable');
    end`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger if exists profile_versions_frozen`.execute(db);
}
