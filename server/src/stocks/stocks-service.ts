import type {
  CreateStockRequest,
  Stock,
  StockDetail,
  StockQuery,
  UpdateStockSheetRequest,
  User,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import {
  listProfilesOfStock,
  listVersionsOfProfiles,
  toProfile,
  toVersionSummary,
  userNamesById,
} from '../profiles/profile-repository';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { findStockById, insertStock, listStocks, toStock, updateStockSheet } from './stock-repository';

const stockNotFound = (id: number) => new AppError('stock-not-found', 404, `No stock with id ${id}.`);

/**
 * The stock catalogue: stocks and their sheets, each change audited with the stock before and after, and a stock
 * with its profiles and their versions.
 *
 * @example
 * const stocks = createStocksService({ db, clock });
 * await stocks.updateSheet(manager, 4, { handlingNotes: 'Load in subdued light.' });
 */
export function createStocksService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    async list(query: StockQuery): Promise<Stock[]> {
      return (await listStocks(db, query)).map(toStock);
    },

    async create(actor: User, body: CreateStockRequest): Promise<Stock> {
      return db.transaction().execute(async (trx) => {
        const row = await insertStock(trx, body, clock.now()).catch((err: unknown) => {
          if (!isUniqueViolation(err)) throw err;
          throw new AppError('stock-name-taken', 409, `A stock named ${body.name} already exists.`, [
            { path: 'body.name', message: 'Another stock has this name' },
          ]);
        });
        const created = toStock(row);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor,
          action: 'stock-created',
          target: `stock:${row.id}`,
          before: null,
          after: created,
        });
        return created;
      });
    },

    /** A stock with its profiles, each with its versions and who made and published them. */
    async detail(id: number): Promise<StockDetail> {
      const row = await findStockById(db, id);
      if (!row) throw stockNotFound(id);
      const profiles = await listProfilesOfStock(db, row.id);
      const versions = await listVersionsOfProfiles(
        db,
        profiles.map((p) => p.id),
      );
      const names = await userNamesById(
        db,
        versions.flatMap((v) => [v.created_by, v.published_by]),
      );
      const nameOf = (userId: number | null) => (userId === null ? null : (names.get(userId) ?? null));
      return {
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
    },

    async updateSheet(actor: User, id: number, body: UpdateStockSheetRequest): Promise<Stock> {
      return db.transaction().execute(async (trx) => {
        const before = await findStockById(trx, id);
        if (!before) throw stockNotFound(id);
        const updated = toStock((await updateStockSheet(trx, id, body))!);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor,
          action: 'stock-sheet-updated',
          target: `stock:${id}`,
          before: toStock(before),
          after: updated,
        });
        return updated;
      });
    },
  };
}
