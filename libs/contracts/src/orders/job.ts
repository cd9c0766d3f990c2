import { z } from 'zod';
import { frameStatusSchema, qcFlagSchema } from './frame';

/** Kinds of background job. */
export const jobKinds = ['invert-roll'] as const;
export const jobKindSchema = z.enum(jobKinds);
export type JobKind = z.infer<typeof jobKindSchema>;

/** Where a job stands; done, failed and cancelled are final. */
export const jobStates = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export const jobStateSchema = z.enum(jobStates);
export type JobState = z.infer<typeof jobStateSchema>;

/** A durable background job as the API returns it. */
export const jobSchema = z.object({
  id: z.number().int().positive(),
  kind: jobKindSchema,
  /** What it works on, e.g. `roll:12`. */
  target: z.string(),
  state: jobStateSchema,
  attempts: z.number().int().min(0),
  progress: z.object({
    done: z.number().int().min(0),
    failed: z.number().int().min(0),
    total: z.number().int().min(0),
  }),
  error: z.string().nullable(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
});
export type Job = z.infer<typeof jobSchema>;

/** Events of a roll's live stream (Server-Sent Events; the SSE event name is `type`). */
export const rollEventSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('job'), job: jobSchema }),
  z.object({
    type: z.literal('frame'),
    frameId: z.number().int().positive(),
    status: frameStatusSchema,
    qcFlags: z.array(qcFlagSchema),
    error: z.string().nullable(),
  }),
]);
export type RollEvent = z.infer<typeof rollEventSchema>;
