import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit, type AuditAction } from '../audit/audit-log';
import type { Database } from '../db/database';

/** Audit actions of orders, rolls, frames and inversion jobs. */
export type OrderAuditAction =
  | 'order-created'
  | 'order-status-changed'
  | 'roll-created'
  | 'roll-base-changed'
  | 'frames-uploaded'
  | 'frame-base-changed'
  | 'roll-adjusted'
  | 'frame-adjusted'
  | 'inversion-started'
  | 'inversion-cancelled';

/**
 * Appends a change of an order, roll, frame or job to the audit log. The audit module's action list names account
 * events; these names extend it without editing it.
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
    action: event.action as string as AuditAction,
    target: event.target,
    details: event.details,
  });
}
