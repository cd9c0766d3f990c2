import type { OrderDraft, PriceList, Quote, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { readPriceList, writePriceList } from './price-list-store';
import { QuoteError, quoteOrder } from './quote-order';

/**
 * The lab's price list and quotes of order drafts against it.
 *
 * @example
 * const prices = createPricesService({ db, clock });
 * const quote = await prices.quote({ rolls: [...], scanSize: 'large', outputFormats: ['jpeg'], negatives: 'collect' });
 */
export function createPricesService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    list: (): Promise<PriceList> => readPriceList(db),

    /** Replaces the price list, audited with what it was before. */
    async replace(actor: User, list: PriceList): Promise<PriceList> {
      await db.transaction().execute(async (trx) => {
        const before = await readPriceList(trx);
        await writePriceList(trx, list);
        await recordAudit(trx, {
          at: clock.now(),
          actor,
          action: 'settings-changed',
          target: 'price-list',
          details: { before, after: list },
        });
      });
      return list;
    },

    /** Prices a draft; 422 `no-price` when the list has no price for something in it. */
    async quote(draft: OrderDraft): Promise<Quote> {
      try {
        return quoteOrder(await readPriceList(db), draft);
      } catch (err) {
        if (err instanceof QuoteError) {
          throw new AppError(
            'no-price',
            422,
            `${err.message} Ask the lab, or choose another format or scan size.`,
          );
        }
        throw err;
      }
    },
  };
}
