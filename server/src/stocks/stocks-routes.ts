import {
  createStockRequestSchema,
  managerRoles,
  stockQuerySchema,
  updateStockSheetRequestSchema,
} from '@clearbase/contracts';
import { z } from 'zod';
import type { RouteModule } from '../http/route-module';
import { createStocksService } from './stocks-service';

const stockIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive stock id') });

/** The stock catalogue (the rules are in stocks-service.ts). */
export const stocksRoutes: RouteModule = (api, { db, clock }) => {
  const stocks = createStocksService({ db, clock });

  api.define(
    {
      method: 'get',
      path: '/api/stocks',
      roles: 'signed-in',
      query: stockQuerySchema,
      summary: 'The stock catalogue, filtered',
    },
    async (_req, res, { query }) => {
      res.json({ stocks: await stocks.list(query) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/stocks',
      roles: managerRoles,
      body: createStockRequestSchema,
      summary: 'Add a stock',
    },
    async (_req, res, { body, user }) => {
      res.status(201).json({ stock: await stocks.create(user!, body) });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/stocks/:id',
      roles: 'signed-in',
      params: stockIdParams,
      summary: 'A stock with its profiles and their versions',
    },
    async (_req, res, { params }) => {
      res.json(await stocks.detail(params.id));
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/stocks/:id',
      roles: managerRoles,
      params: stockIdParams,
      body: updateStockSheetRequestSchema,
      summary: 'Change a stock’s sheet: notes, EI, latitude, push/pull, reciprocity, handling',
    },
    async (_req, res, { params, body, user }) => {
      res.json({ stock: await stocks.updateSheet(user!, params.id, body) });
    },
  );
};
