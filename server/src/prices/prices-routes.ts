import { managerRoles, orderDraftSchema, priceListSchema } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { createPricesService } from './prices-service';

/** The price list (anyone signed in reads it, managers edit it) and quotes of order drafts. */
export const pricesRoutes: RouteModule = (api, { db, clock }) => {
  const prices = createPricesService({ db, clock });

  api.define(
    { method: 'get', path: '/api/prices', roles: 'signed-in', summary: 'The lab’s price list' },
    async (_req, res) => {
      res.json(await prices.list());
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/prices',
      roles: managerRoles,
      body: priceListSchema,
      summary: 'Replace the price list',
    },
    async (_req, res, { body, user }) => {
      res.json(await prices.replace(user!, body));
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
      res.json(await prices.quote(body));
    },
  );
};
