import { z } from 'zod';

/** An RFC 9457 problem document, as every API error is answered. */
export const problemSchema = z.object({
  type: z.string().default('about:blank'),
  title: z.string(),
  status: z.number().int(),
  detail: z.string().optional(),
  instance: z.string().optional(),
  /** A stable machine-readable reason, e.g. `wrong-credentials`, `email-taken`, `csrf-token-invalid`. */
  code: z.string().optional(),
  /** Schema errors: one per field, with its path. */
  errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
});
export type Problem = z.infer<typeof problemSchema>;
