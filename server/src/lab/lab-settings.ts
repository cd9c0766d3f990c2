import { labSchema, type Lab, type User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';

/** Shown until an admin names the lab. */
const unnamedLab: Lab = { name: 'Clearbase', town: '', address: '', payOnCollection: false };

/** The lab's name, address and payment setting; a missing or damaged entry falls back to a neutral name. */
export async function readLab(db: Kysely<Database>): Promise<Lab> {
  const row = await db.selectFrom('settings').select('value').where('key', '=', 'lab').executeTakeFirst();
  if (!row) return unnamedLab;
  try {
    const parsed = labSchema.safeParse(JSON.parse(row.value));
    return parsed.success ? parsed.data : unnamedLab;
  } catch {
    return unnamedLab;
  }
}

/**
 * Replaces the lab's settings, audited with what they were.
 *
 * @example
 * await writeLab({ db, clock }, admin, { name: 'Northlight Film Lab', town: 'Harwick', address: '', payOnCollection: true });
 */
export async function writeLab(
  { db, clock }: { db: Kysely<Database>; clock: Clock },
  actor: User,
  lab: Lab,
): Promise<Lab> {
  await db.transaction().execute(async (trx) => {
    const before = await readLab(trx);
    const value = JSON.stringify(lab);
    await trx
      .insertInto('settings')
      .values({ key: 'lab', value })
      .onConflict((oc) => oc.column('key').doUpdateSet({ value }))
      .execute();
    await recordAudit(trx, {
      at: clock.now(),
      actor,
      action: 'settings-changed',
      target: 'lab',
      details: { before, after: lab },
    });
  });
  return lab;
}
