import type { Kysely } from 'kysely';
import { recordAudit, type AuditAction, type AuditEvent } from '../audit/audit-log';
import type { Database } from '../db/database';

/** Audit actions of the stock catalogue, scanners and stock profiles. */
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
  | 'profile-version-retired';

/**
 * Appends a catalogue change to the audit log, with what it was before and after.
 * The audit module's action list names account events; these names extend it without editing it.
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
  return recordAudit(db, { ...rest, action: action as string as AuditAction, details: { before, after } });
}
