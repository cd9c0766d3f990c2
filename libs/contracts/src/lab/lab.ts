import { z } from 'zod';

/** The lab running this Clearbase, as shown in the page header and on receipts. */
export const labSchema = z.object({
  name: z.string().trim().min(1, 'Enter the lab’s name').max(120),
  town: z.string().max(120),
  address: z.string().max(300),
  /**
   * Customers may pay when they collect: a ready order's full-size scans are released before it is paid. Off unless
   * the lab turns it on (our choice: paying first is the safe default).
   */
  payOnCollection: z.boolean().default(false),
});
export type Lab = z.infer<typeof labSchema>;
