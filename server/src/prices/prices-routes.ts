import { orderDraftSchema, priceListSchema } from '@clearbase/contracts';
import { recordAudit } from '../audit/audit-log';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { readPriceList, writePriceList } from './price-list-store';
import { QuoteError, quoteOrder } from './quote-order';

/** The price list (anyone signed in reads it, managers edit it) and quotes of order drafts. */
export const pricesRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/prices', roles: 'signed-in', summary: 'The lab’s price list' },
    async (_req, res) => {
      res.json(await readPriceList(db));
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/prices',
      roles: ['manager', 'admin'],
      body: priceListSchema,
      summary: 'Replace the price list',
    },
    async (_req, res, { body, user }) => {
      const before = await readPriceList(db);
      await db.transaction().execute(async (trx) => {
        await writePriceList(trx, body);
        await recordAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'settings-changed',
          target: 'price-list',
          details: { before, after: body },
        });
      });
      res.json(body);
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/prices/quote',
      roles: 'signed-in',
      body: orderDraftSchema,
      summary: 'Price an order draft with the current price list',
    },
    async (_req, res, { body }) => {
      try {
        res.json(quoteOrder(await readPriceList(db), body));
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
  );
};
