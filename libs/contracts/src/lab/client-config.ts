import { z } from 'zod';

/** GET /api/config/client: the few server settings the web app shapes itself by. Nothing secret goes here. */
export const clientConfigSchema = z.object({
  /** The local mail catcher and payment fake run instead of the hosted services (LOCAL_FAKES). */
  localFakes: z.boolean(),
});
export type ClientConfig = z.infer<typeof clientConfigSchema>;
