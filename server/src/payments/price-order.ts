import {
  filmProcessSchema,
  priceListSchema,
  scanSizeSchema,
  type OrderDraft,
  type PriceList,
  type Quote,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { readPriceList } from '../prices/price-list-store';
import { QuoteError, quoteOrder } from '../prices/quote-order';
import type { findOrderForPayment } from './payment-repository';

export type OrderForPayment = NonNullable<Awaited<ReturnType<typeof findOrderForPayment>>>;

/** The price list an order was placed under, if it kept one that still reads as a price list. */
function ownPriceList(order: OrderForPayment): PriceList | undefined {
  if (!order.price_list) return undefined;
  try {
    const parsed = priceListSchema.safeParse(JSON.parse(order.price_list));
    return parsed.success ? parsed.data : undefined;
  } catch {
    return undefined;
  }
}

/**
 * What the order costs, its rolls as they are now, at the prices of the list it was placed under: a later change of
 * the lab's prices changes nothing it owes, and a roll added afterwards is charged at the order's prices. Orders
 * placed before orders kept their list, and a roll of a format that list has no price for, are priced from the lab's
 * current list. Returns the QuoteError naming what neither list prices.
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
  const lists = [ownPriceList(order), await readPriceList(db)].filter((l): l is PriceList => l !== undefined);
  let refusal: QuoteError | undefined;
  for (const list of lists) {
    try {
      return quoteOrder(list, draft);
    } catch (err) {
      if (!(err instanceof QuoteError)) throw err;
      refusal ??= err;
    }
  }
  return refusal!;
}
