import { z } from 'zod';

/** The lab running this Clearbase, as shown in the page header and on receipts. */
export const labSchema = z.object({
  name: z.string().trim().min(1, 'Enter the lab’s name').max(120),
  town: z.string().max(120),
  address: z.string().max(300),
});
export type Lab = z.infer<typeof labSchema>;
