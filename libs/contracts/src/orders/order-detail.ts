import { z } from 'zod';
import { frameSchema } from './frame';
import { jobSchema } from './job';
import { orderSchema } from './order';
import { rollSchema } from './roll';

/** An order with its rolls. */
export const orderDetailSchema = z.object({ order: orderSchema, rolls: z.array(rollSchema) });
export type OrderDetail = z.infer<typeof orderDetailSchema>;

/** A roll with its frames and its latest inversion job, if any. */
export const rollDetailSchema = z.object({
  roll: rollSchema,
  frames: z.array(frameSchema),
  job: jobSchema.nullable(),
});
export type RollDetail = z.infer<typeof rollDetailSchema>;
