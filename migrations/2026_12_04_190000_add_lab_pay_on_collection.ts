import type { Kysely } from 'kysely';

// The lab's settings gain `payOnCollection` (customers pay when they collect, so a ready order's scans are released
// before it is paid). A lab named before this change pays first, as every order did until now: the stored entry says
// so explicitly. A lab not named yet has no entry and reads the same default.
export async function up(db: Kysely<any>): Promise<void> {
  const row = await db.selectFrom('settings').select('value').where('key', '=', 'lab').executeTakeFirst();
  if (!row) return;
  const lab = JSON.parse(row.value as string) as Record<string, unknown>;
  if ('payOnCollection' in lab) return;
  await db
    .updateTable('settings')
    .set({ value: JSON.stringify({ ...lab, payOnCollection: false }) })
    .where('key', '=', 'lab')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  const row = await db.selectFrom('settings').select('value').where('key', '=', 'lab').executeTakeFirst();
  if (!row) return;
  const { payOnCollection: _dropped, ...lab } = JSON.parse(row.value as string) as Record<string, unknown>;
  await db
    .updateTable('settings')
    .set({ value: JSON.stringify(lab) })
    .where('key', '=', 'lab')
    .execute();
}
