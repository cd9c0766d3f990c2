import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { readLab } from '../lab/lab-settings';
import type { MailMessage } from './mail-message';
import { renderMail, type MailKind, type MailTemplateData } from './mail-templates';
import type { OutboxRow } from './outbox-table';

/**
 * Puts a message in the outbox. Call it with the transaction of the change the message tells of, so the two are
 * committed together or not at all; the sender delivers it afterwards.
 *
 * @example
 * await db.transaction().execute(async (trx) => { ...; await enqueueMail(trx, message, clock.now()); });
 */
export async function enqueueMail(db: Kysely<Database>, message: MailMessage, now: Date): Promise<number> {
  const at = now.toISOString();
  const row = await db
    .insertInto('outbox')
    .values({
      to_address: message.to,
      subject: message.subject,
      text_body: message.text,
      html_body: message.html,
      kind: message.kind,
      next_attempt_at: at,
      last_error: null,
      created_at: at,
      sent_at: null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Renders a template in the lab's name (read in the same transaction) and puts it in the outbox. */
export async function enqueueTemplatedMail<K extends MailKind>(
  db: Kysely<Database>,
  to: string,
  kind: K,
  data: MailTemplateData[K],
  now: Date,
): Promise<number> {
  return enqueueMail(db, renderMail(await readLab(db), to, kind, data), now);
}

/** Pending messages whose next attempt is due, oldest first. */
export function findDueMail(db: Kysely<Database>, now: Date, limit: number): Promise<OutboxRow[]> {
  return db
    .selectFrom('outbox')
    .selectAll()
    .where('state', '=', 'pending')
    .where('next_attempt_at', '<=', now.toISOString())
    .orderBy('next_attempt_at')
    .orderBy('id')
    .limit(limit)
    .execute();
}

export async function markMailSent(
  db: Kysely<Database>,
  id: number,
  attempts: number,
  now: Date,
): Promise<void> {
  await db
    .updateTable('outbox')
    .set({ state: 'sent', attempts, sent_at: now.toISOString(), last_error: null })
    .where('id', '=', id)
    .execute();
}

export async function markMailAttemptFailed(
  db: Kysely<Database>,
  id: number,
  change: { attempts: number; error: string; nextAttemptAt: Date | null },
): Promise<void> {
  await db
    .updateTable('outbox')
    .set({
      attempts: change.attempts,
      last_error: change.error.slice(0, 1000),
      ...(change.nextAttemptAt
        ? { next_attempt_at: change.nextAttemptAt.toISOString() }
        : { state: 'failed' as const }),
    })
    .where('id', '=', id)
    .execute();
}

/** Messages not delivered in one state, newest first (at most `limit`), for an admin to look after. */
export function listUndeliveredMail(
  db: Kysely<Database>,
  state: 'pending' | 'failed',
  limit: number,
): Promise<OutboxRow[]> {
  return db
    .selectFrom('outbox')
    .selectAll()
    .where('state', '=', state)
    .orderBy('created_at', 'desc')
    .orderBy('id', 'desc')
    .limit(limit)
    .execute();
}

export function findMail(db: Kysely<Database>, id: number): Promise<OutboxRow | undefined> {
  return db.selectFrom('outbox').selectAll().where('id', '=', id).executeTakeFirst();
}

/**
 * Makes an undelivered message due now: the sender's next pass tries it once more. A message that had given up goes
 * back to pending for that one try; if it fails again it gives up again at once (its attempts are kept).
 */
export async function scheduleMailNow(db: Kysely<Database>, id: number, now: Date): Promise<boolean> {
  const result = await db
    .updateTable('outbox')
    .set({ state: 'pending', next_attempt_at: now.toISOString() })
    .where('id', '=', id)
    .where('state', '!=', 'sent')
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}
