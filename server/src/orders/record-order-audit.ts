import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit, type OrderAuditAction } from '../audit/audit-log';
import type { Database } from '../db/database';

export type { OrderAuditAction };

/**
 * Appends a change of an order, roll, frame or job to the audit log.
 */
export function recordOrderAudit(
  db: Kysely<Database>,
  event: {
    at: Date;
    actor: User;
    action: OrderAuditAction;
    target: string;
    details: Record<string, unknown>;
  },
): Promise<void> {
  return recordAudit(db, {
    at: event.at,
    actor: { id: event.actor.id, email: event.actor.email },
    action: event.action,
    target: event.target,
    details: event.details,
  });
}
