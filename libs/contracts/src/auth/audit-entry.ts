import { z } from 'zod';

/** One line of the audit log: who did what to what, and when (ISO-8601 UTC). */
export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorId: z.number().int().nullable(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  target: z.string().nullable(),
  details: z.record(z.string(), z.unknown()).nullable(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
  action: z.string().max(64).optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditListResponseSchema = z.object({
  entries: z.array(auditEntrySchema),
  total: z.number().int(),
});
export type AuditListResponse = z.infer<typeof auditListResponseSchema>;
