import { sql, type Kysely } from 'kysely';

// Versions only move forward: draft -> published -> retired.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create trigger profile_versions_forward_only
    before update of status on profile_versions
    when not (
      new.status = old.status
      or (old.status = 'draft' and new.status = 'published')
      or (old.status = 'published' and new.status = 'retired')
    )
    begin
      select raise(abort, 'profile versions move only from draft to published to retired');
    end`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger if exists profile_versions_forward_only`.execute(db);
}
