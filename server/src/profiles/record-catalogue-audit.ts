import type { Kysely } from 'kysely';
import { recordAudit, type AuditEvent, type CatalogueAuditAction } from '../audit/audit-log';
import type { Database } from '../db/database';

/** Audit actions of the stock catalogue, scanners and stock profiles. */
export type { CatalogueAuditAction };

/**
 * Appends a catalogue change to the audit log, with what it was before and after.
 */
export function recordCatalogueAudit(
  db: Kysely<Database>,
  event: Omit<AuditEvent, 'action' | 'details'> & {
    action: CatalogueAuditAction;
    before: unknown;
    after: unknown;
  },
): Promise<void> {
  const { before, after, action, ...rest } = event;
  return recordAudit(db, { ...rest, action, details: { before, after } });
}
