import { z } from 'zod';
import { scanSizeSchema } from '../orders/order';
import { filmProcessSchema } from '../stocks/stock';

/** An amount in the currency's minor unit (cents, pence…): never a fraction, never a float. */
// 10 000 000 minor units (100 000.00): far above any one price of a lab (our choice)
export const amountMinorSchema = z.int('Expected a whole number of minor units').min(0).max(10_000_000);

// three capital letters: the alphabetic codes of ISO 4217
export const currencySchema = z
  .string()
  .regex(/^[A-Z]{3}$/, 'Expected a three-letter ISO 4217 currency code');

export const developPriceSchema = z.strictObject({
  format: z.string().trim().min(1, 'Name the frame format, e.g. 135-36').max(40),
  process: filmProcessSchema,
  amountMinor: amountMinorSchema,
});
export type DevelopPrice = z.infer<typeof developPriceSchema>;

export const scanPriceSchema = z.strictObject({ size: scanSizeSchema, amountMinor: amountMinorSchema });
export type ScanPrice = z.infer<typeof scanPriceSchema>;

/**
 * What the lab charges: developing per roll by format and process, scanning per roll by size, push/pull per stop, and
 * posting the negatives back, per order (0 when the lab does not charge for it; collecting them is free).
 */
export const priceListSchema = z.strictObject({
  currency: currencySchema,
  develop: z
    .array(developPriceSchema)
    .max(200)
    .refine(
      (rows) => new Set(rows.map((r) => `${r.format}|${r.process}`)).size === rows.length,
      'List each format and process once',
    ),
  scan: z
    .array(scanPriceSchema)
    .max(20)
    .refine((rows) => new Set(rows.map((r) => r.size)).size === rows.length, 'List each scan size once'),
  pushPullPerStopMinor: amountMinorSchema,
  // absent in price lists saved before it existed: read as free
  returnByPostMinor: amountMinorSchema.default(0),
});
export type PriceList = z.infer<typeof priceListSchema>;

/** The parts of an order that set its price. */
export const orderDraftSchema = z.strictObject({
  scanSize: scanSizeSchema,
  rolls: z
    .array(
      z.strictObject({
        format: z.string().trim().min(1).max(40),
        process: filmProcessSchema,
        // whole or half stops, from three stops pulled to four pushed: common practice of the trade, from memory
        pushPull: z
          .number()
          .min(-3)
          .max(4)
          .refine((v) => Number.isInteger(v * 2), 'Push or pull in whole or half stops'),
      }),
    )
    .min(1, 'Add at least one roll')
    .max(100),
  /** What happens to the negatives: posting them back is priced once per order. */
  negatives: z.enum(['post', 'collect']).default('collect'),
});
export type OrderDraft = z.infer<typeof orderDraftSchema>;

export const quoteLineSchema = z.object({
  /** The roll the line is for; null for a line of the whole order (postage). */
  rollIndex: z.number().int().min(0).nullable(),
  kind: z.enum(['develop', 'scan', 'push-pull', 'return-by-post']),
  label: z.string(),
  amountMinor: z.number().int(),
});
export type QuoteLine = z.infer<typeof quoteLineSchema>;

export const quoteSchema = z.object({
  currency: currencySchema,
  lines: z.array(quoteLineSchema),
  totalMinor: z.number().int(),
});
export type Quote = z.infer<typeof quoteSchema>;
