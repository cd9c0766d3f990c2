import {
  createStockRequestSchema,
  stockQuerySchema,
  updateStockSheetRequestSchema,
  type StockDetail,
} from '@clearbase/contracts';
import { z } from 'zod';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import {
  listProfilesOfStock,
  listVersionsOfProfiles,
  toProfile,
  toVersionSummary,
  userNamesById,
} from '../profiles/profile-repository';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { findStockById, insertStock, listStocks, toStock, updateStockSheet } from './stock-repository';

const stockIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive stock id') });

export const stocksRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    {
      method: 'get',
      path: '/api/stocks',
      roles: 'signed-in',
      query: stockQuerySchema,
      summary: 'The stock catalogue, filtered',
    },
    async (_req, res, { query }) => {
      res.json({ stocks: (await listStocks(db, query)).map(toStock) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/stocks',
      roles: ['manager', 'admin'],
      body: createStockRequestSchema,
      summary: 'Add a stock',
    },
    async (_req, res, { body, user }) => {
      const stock = await db.transaction().execute(async (trx) => {
        let row;
        try {
          row = await insertStock(trx, body, clock.now());
        } catch (err) {
          if (isUniqueViolation(err))
            throw new AppError('stock-name-taken', 409, `A stock named ${body.name} already exists.`, [
              { path: 'body.name', message: 'Another stock has this name' },
            ]);
          throw err;
        }
        const created = toStock(row);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'stock-created',
          target: `stock:${row.id}`,
          before: null,
          after: created,
        });
        return created;
      });
      res.status(201).json({ stock });
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
      const row = await findStockById(db, params.id);
      if (!row) throw new AppError('stock-not-found', 404, `No stock with id ${params.id}.`);
      const profiles = await listProfilesOfStock(db, row.id);
      const versions = await listVersionsOfProfiles(
        db,
        profiles.map((p) => p.id),
      );
      const names = await userNamesById(
        db,
        versions.flatMap((v) => [v.created_by, v.published_by]),
      );
      const nameOf = (id: number | null) => (id === null ? null : (names.get(id) ?? null));
      const detail: StockDetail = {
        stock: toStock(row),
        profiles: profiles.map((p) => ({
          ...toProfile(p),
          versions: versions
            .filter((v) => v.profile_id === p.id)
            .map((v) => ({
              ...toVersionSummary(v),
              createdByName: nameOf(v.created_by),
              publishedByName: nameOf(v.published_by),
            })),
        })),
      };
      res.json(detail);
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/stocks/:id',
      roles: ['manager', 'admin'],
      params: stockIdParams,
      body: updateStockSheetRequestSchema,
      summary: 'Change a stock’s sheet: notes, EI, latitude, push/pull, reciprocity, handling',
    },
    async (_req, res, { params, body, user }) => {
      const stock = await db.transaction().execute(async (trx) => {
        const before = await findStockById(trx, params.id);
        if (!before) throw new AppError('stock-not-found', 404, `No stock with id ${params.id}.`);
        const updated = toStock((await updateStockSheet(trx, params.id, body))!);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'stock-sheet-updated',
          target: `stock:${params.id}`,
          before: toStock(before),
          after: updated,
        });
        return updated;
      });
      res.json({ stock });
    },
  );
};
