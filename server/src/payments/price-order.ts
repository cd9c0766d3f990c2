import { filmProcessSchema, scanSizeSchema, type OrderDraft, type Quote } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { readPriceList } from '../prices/price-list-store';
import { QuoteError, quoteOrder } from '../prices/quote-order';
import type { findOrderForPayment } from './payment-repository';

export type OrderForPayment = NonNullable<Awaited<ReturnType<typeof findOrderForPayment>>>;

/**
 * What the order costs now, from the lab's price list and its rolls as they are; the QuoteError naming what the list
 * does not price when it cannot.
 *
 * @example
 * const quote = await priceOrder(db, await findOrderForPayment(db, 12));
 */
export async function priceOrder(db: Kysely<Database>, order: OrderForPayment): Promise<Quote | QuoteError> {
  const draft: OrderDraft = {
    scanSize: scanSizeSchema.parse(order.scan_size),
    rolls: order.rolls.map((r) => ({
      format: r.format,
      process: filmProcessSchema.parse(r.process),
      pushPull: r.push_pull,
    })),
    negatives: order.negatives.method,
  };
  const list = await readPriceList(db);
  try {
    return quoteOrder(list, draft);
  } catch (err) {
    if (err instanceof QuoteError) return err;
    throw err;
  }
}
