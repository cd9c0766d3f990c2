import { z } from 'zod';
import { amountMinorSchema, currencySchema } from './price-list';

/** Where a checkout stands: open at the provider, paid (confirmed by its signed event), declined, or refunded. */
export const paymentStatuses = ['open', 'paid', 'declined', 'refunded', 'partly-refunded'] as const;
export const paymentStatusSchema = z.enum(paymentStatuses);
export type PaymentStatus = z.infer<typeof paymentStatusSchema>;

export const paymentSchema = z.object({
  id: z.number().int().positive(),
  orderId: z.number().int().positive(),
  amountMinor: z.number().int(),
  currency: currencySchema,
  status: paymentStatusSchema,
  refundedMinor: z.number().int(),
  createdAt: z.string(),
  paidAt: z.string().nullable(),
});
export type Payment = z.infer<typeof paymentSchema>;

/**
 * What an order costs from the price list, what has been paid towards it and what is left, in minor units. Refunds the
 * lab grants do not reopen a balance; a payment refunded because the order was already paid counts for nothing.
 * `priceMinor` and `dueMinor` are null when the price list cannot price the order (the lab prices it by hand).
 */
export const orderBalanceSchema = z.object({
  currency: currencySchema,
  priceMinor: z.number().int().nullable(),
  paidMinor: z.number().int(),
  dueMinor: z.number().int().nullable(),
});
export type OrderBalance = z.infer<typeof orderBalanceSchema>;

export const paymentListResponseSchema = z.object({
  payments: z.array(paymentSchema),
  balance: orderBalanceSchema,
});
export type PaymentListResponse = z.infer<typeof paymentListResponseSchema>;

/** POST /api/orders/:id/checkout answers where to send the customer's browser. */
export const checkoutResponseSchema = z.object({ payment: paymentSchema, checkoutUrl: z.string() });
export type CheckoutResponse = z.infer<typeof checkoutResponseSchema>;

/** POST /api/payments/:id/refund: all that is left when amountMinor is omitted. */
export const refundRequestSchema = z.strictObject({ amountMinor: amountMinorSchema.min(1).optional() });
export type RefundRequest = z.infer<typeof refundRequestSchema>;
