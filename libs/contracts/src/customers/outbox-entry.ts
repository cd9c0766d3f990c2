import { z } from 'zod';

/** The outbox states an admin looks after: waiting to be tried (again), or given up. */
export const undeliveredMailStates = ['failed', 'pending'] as const;
export const undeliveredMailStateSchema = z.enum(undeliveredMailStates);
export type UndeliveredMailState = z.infer<typeof undeliveredMailStateSchema>;

/**
 * One e-mail the outbox has not delivered, as admins see it: to whom, about what, and how sending it went. Never its
 * body: a password-reset or welcome mail carries a link that opens the account.
 */
export const outboxEntrySchema = z.object({
  id: z.number().int().positive(),
  to: z.string(),
  subject: z.string(),
  /** Which template made it, e.g. `scans-ready`. */
  kind: z.string(),
  state: undeliveredMailStateSchema,
  attempts: z.number().int().min(0),
  lastError: z.string().nullable(),
  /** When the sender tries it next; null once it has given up. */
  nextAttemptAt: z.string().nullable(),
  createdAt: z.string(),
});
export type OutboxEntry = z.infer<typeof outboxEntrySchema>;

/** GET /api/admin/outbox?status=failed|pending */
export const outboxQuerySchema = z.strictObject({ status: undeliveredMailStateSchema.default('failed') });
export type OutboxQuery = z.infer<typeof outboxQuerySchema>;

export const outboxListResponseSchema = z.object({ entries: z.array(outboxEntrySchema) });
export type OutboxListResponse = z.infer<typeof outboxListResponseSchema>;

/** POST /api/admin/outbox/:id/retry answers with the entry, due now. */
export const outboxRetryResponseSchema = z.object({ entry: outboxEntrySchema });
export type OutboxRetryResponse = z.infer<typeof outboxRetryResponseSchema>;
