import { z } from 'zod';
import { orderStatuses, outputFormats, scanSizes, type ScanSize } from '../values/order-enums';
import { notesMaxLength } from '../values/text-limits';
import { createRollRequestSchema } from './roll';

const positiveId = z.int('Expected a whole id').positive('Expected a positive id');
/** Ids in paths and query strings arrive as text. */
export const idText = (what: string) => z.coerce.number().int().positive(`Expected a positive ${what} id`);

export const orderStatusSchema = z.enum(orderStatuses);
export const outputFormatSchema = z.enum(outputFormats);
export const scanSizeSchema = z.enum(scanSizes);

/**
 * Long edge in pixels of each scan size; `full` keeps the scan as made.
 * 3000 and 6000 px: typical lab scan sizes for 35 mm, common practice of the trade, from memory.
 */
export const scanSizeLongEdge: Readonly<Record<ScanSize, number | null>> = {
  standard: 3000,
  large: 6000,
  full: null,
};

const addressLine = (what: string, max: number) =>
  z.string().trim().min(1, `Give the ${what}`).max(max, `At most ${max} characters`);

/** Where the lab posts a customer's negatives back to. */
export const postalAddressSchema = z.strictObject({
  name: addressLine('name to post to', 120),
  line1: addressLine('street and number', 200),
  line2: z.string().trim().max(200, 'At most 200 characters').default(''),
  town: addressLine('town or city', 120),
  // 20 characters holds the postcode of any country, with spaces: our choice
  postcode: z.string().trim().max(20, 'At most 20 characters').default(''),
  country: addressLine('country', 80),
});
export type PostalAddress = z.infer<typeof postalAddressSchema>;

/**
 * What happens to the negatives once the lab is done with them (the scans are always downloaded): posted back to an
 * address, or kept at the lab until the customer collects them.
 */
export const negativesReturnSchema = z.discriminatedUnion('method', [
  z.strictObject({ method: z.literal('post'), address: postalAddressSchema }),
  z.strictObject({ method: z.literal('collect') }),
]);
export type NegativesReturn = z.infer<typeof negativesReturnSchema>;

/** An order as the API returns it. */
export const orderSchema = z.object({
  id: z.number().int().positive(),
  customerId: z.number().int().positive(),
  customerName: z.string(),
  status: orderStatusSchema,
  notes: z.string(),
  outputFormats: z.array(outputFormatSchema),
  scanSize: scanSizeSchema,
  rollCount: z.number().int().min(0),
  negatives: negativesReturnSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Order = z.infer<typeof orderSchema>;

/**
 * What a customer sends to place an order; staff placing one for a customer name them with customerId. The rolls
 * listed are added with it in one go: either the order and every roll are recorded, or nothing is.
 */
export const createOrderRequestSchema = z.strictObject({
  customerId: positiveId.optional(),
  notes: z.string().trim().max(notesMaxLength).default(''),
  outputFormats: z
    .array(outputFormatSchema)
    .min(1, 'Choose at least one file format')
    .max(outputFormats.length)
    .refine((f) => new Set(f).size === f.length, 'List each format once')
    .default(['jpeg']),
  scanSize: scanSizeSchema.default('standard'),
  negatives: negativesReturnSchema.default({ method: 'collect' }),
  // 100 rolls: as many as the quote prices at once (orderDraftSchema)
  rolls: z.array(createRollRequestSchema).max(100, 'At most 100 rolls on one order').default([]),
});
export type CreateOrderRequest = z.infer<typeof createOrderRequestSchema>;

/** A customer staff may place an order for. */
export const orderCustomerSchema = z.object({
  id: z.number().int().positive(),
  name: z.string(),
  email: z.string(),
});
export type OrderCustomer = z.infer<typeof orderCustomerSchema>;

export const orderCustomerListResponseSchema = z.object({ customers: z.array(orderCustomerSchema) });
export type OrderCustomerListResponse = z.infer<typeof orderCustomerListResponseSchema>;

/** Filters of the order list; staff see every order, customers only their own. */
export const orderQuerySchema = z.strictObject({
  status: orderStatusSchema.optional(),
  customerId: idText('customer').optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});
export type OrderQuery = z.infer<typeof orderQuerySchema>;

export const orderListResponseSchema = z.object({
  orders: z.array(orderSchema),
  total: z.number().int().min(0),
});
export type OrderListResponse = z.infer<typeof orderListResponseSchema>;

/** Staff move an order on (or cancel it). */
export const updateOrderStatusRequestSchema = z.strictObject({ status: orderStatusSchema });
export type UpdateOrderStatusRequest = z.infer<typeof updateOrderStatusRequestSchema>;

export const idParamsSchema = z.object({ id: idText('whole') });
export type IdParams = z.infer<typeof idParamsSchema>;
