import type { AuditEntry, AuditQuery } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';

/** Sign-in, accounts and the lab's settings. */
export type AccountAuditAction =
  | 'sign-in'
  | 'sign-in-failed'
  | 'sign-out'
  | 'password-changed'
  | 'user-created'
  | 'user-renamed'
  | 'user-role-changed'
  | 'user-disabled'
  | 'user-enabled'
  | 'settings-changed'
  | 'mail-retried';

/** Orders, rolls, frames, their review and inversion jobs. */
export type OrderAuditAction =
  | 'order-created'
  | 'order-status-changed'
  | 'roll-created'
  | 'roll-base-changed'
  | 'frames-uploaded'
  | 'frame-base-changed'
  | 'roll-adjusted'
  | 'frame-adjusted'
  | 'frame-reviewed'
  | 'inversion-started'
  | 'inversion-cancelled';

/** Stocks, scanners, profiles and their versions, and the calibrations that make drafts. */
export type CatalogueAuditAction =
  | 'stock-created'
  | 'stock-sheet-updated'
  | 'scanner-created'
  | 'scanner-updated'
  | 'profile-created'
  | 'profile-imported'
  | 'profile-version-created'
  | 'profile-version-updated'
  | 'profile-version-published'
  | 'profile-version-retired'
  | 'calibration-created';

/** Money: refunds sent to the payment provider, and those it refused. */
export type PaymentAuditAction = 'payment-refunded' | 'payment-refund-refused';

/** Every action the audit log records. */
export type AuditAction = AccountAuditAction | OrderAuditAction | CatalogueAuditAction | PaymentAuditAction;

export interface AuditEvent {
  at: Date;
  actor: { id: number; email: string } | null;
  action: AuditAction;
  target?: string | null;
  details?: Record<string, unknown> | null;
}

/** Appends one line to the audit log. */
export async function recordAudit(db: Kysely<Database>, event: AuditEvent): Promise<void> {
  await db
    .insertInto('audit_log')
    .values({
      at: event.at.toISOString(),
      actor_id: event.actor?.id ?? null,
      actor_email: event.actor?.email ?? null,
      action: event.action,
      target: event.target ?? null,
      details: event.details ? JSON.stringify(event.details) : null,
    })
    .execute();
}

/** Newest first, with the total for paging. */
export async function listAudit(
  db: Kysely<Database>,
  query: AuditQuery,
): Promise<{ entries: AuditEntry[]; total: number }> {
  let base = db.selectFrom('audit_log');
  if (query.action) base = base.where('action', '=', query.action);
  const [rows, count] = await Promise.all([
    base.selectAll().orderBy('id', 'desc').limit(query.limit).offset(query.offset).execute(),
    base.select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow(),
  ]);
  return {
    total: Number(count.n),
    entries: rows.map((r) => ({
      id: r.id,
      at: r.at,
      actorId: r.actor_id,
      actorEmail: r.actor_email,
      action: r.action,
      target: r.target,
      details: r.details ? (JSON.parse(r.details) as Record<string, unknown>) : null,
    })),
  };
}
