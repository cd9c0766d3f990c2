import { sql, type Kysely } from 'kysely';

// The changelog and who published when are part of a published version's record: freeze them with its parameters.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`drop trigger profile_versions_frozen`.execute(db);
  await sql`
    create trigger profile_versions_frozen
    before update of parameters, version, profile_id, parent_version_id, changelog, published_at, published_by, created_at, created_by
    on profile_versions
    when old.status <> 'draft'
    begin
      select raise(abort, 'published profile versions are immutable');
    end`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger profile_versions_frozen`.execute(db);
  await sql`
    create trigger profile_versions_frozen
    before update of parameters, version, profile_id, parent_version_id on profile_versions
    when old.status <> 'draft'
    begin
      select raise(abort, 'published profile versions are immutable');
    end`.execute(db);
}
