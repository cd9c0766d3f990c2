import { z } from 'zod';

/** One e-mail the local mail catcher received, as the development mailbox lists it. */
export const caughtMailSummarySchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
});
export type CaughtMailSummary = z.infer<typeof caughtMailSummarySchema>;

/** The whole message: both parts; `html` has scripts, handlers and active content removed. */
export const caughtMailSchema = caughtMailSummarySchema.extend({
  messageId: z.string().nullable(),
  text: z.string(),
  html: z.string().nullable(),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;

export const caughtMailListSchema = z.object({ messages: z.array(caughtMailSummarySchema) });
export type CaughtMailList = z.infer<typeof caughtMailListSchema>;

export const caughtMailIdParamsSchema = z.object({
  id: z.string().regex(/^[a-z0-9-]{1,80}$/, 'Expected a caught message id'),
});
