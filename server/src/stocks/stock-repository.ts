import {
  defaultReciprocityExponent,
  type CreateStockRequest,
  type FilmProcess,
  type Stock,
  type StockQuery,
  type UpdateStockSheetRequest,
} from '@clearbase/contracts';
import { sql, type Kysely } from 'kysely';
import type { Database, StockRow } from '../db/database';

/** The catalogue by name, narrowed by the optional filters. */
export function listStocks(db: Kysely<Database>, query: StockQuery = {}): Promise<StockRow[]> {
  let select = db.selectFrom('stocks').selectAll();
  if (query.process) select = select.where('process', '=', query.process);
  if (query.masked !== undefined) select = select.where('masked', '=', query.masked ? 1 : 0);
  if (query.q) {
    // escape LIKE's wildcards so a search for "50%" means the text
    const pattern = `%${query.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    select = select.where(
      sql<boolean>`lower(name) like ${pattern} escape '\\' or lower(maker) like ${pattern} escape '\\'`,
    );
  }
  return select.orderBy('name').execute();
}

export function findStockById(db: Kysely<Database>, id: number): Promise<StockRow | undefined> {
  return db.selectFrom('stocks').selectAll().where('id', '=', id).executeTakeFirst();
}

export function findStockByName(db: Kysely<Database>, name: string): Promise<StockRow | undefined> {
  return db.selectFrom('stocks').selectAll().where('name', '=', name).executeTakeFirst();
}

export function insertStock(db: Kysely<Database>, stock: CreateStockRequest, at: Date): Promise<StockRow> {
  return db
    .insertInto('stocks')
    .values({
      name: stock.name,
      maker: stock.maker,
      iso: stock.iso,
      process: stock.process,
      masked: stock.masked ? 1 : 0,
      base_material: stock.baseMaterial,
      frame_formats: JSON.stringify(stock.frameFormats),
      notes: stock.notes,
      recommended_ei: stock.recommendedEi ?? null,
      latitude_under_stops: stock.latitudeUnderStops ?? null,
      latitude_over_stops: stock.latitudeOverStops ?? null,
      push_pull_notes: stock.pushPullNotes ?? '',
      reciprocity_exponent: stock.reciprocityExponent ?? defaultReciprocityExponent,
      handling_notes: stock.handlingNotes ?? '',
      created_at: at.toISOString(),
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Changes the sheet fields given (undefined ones stay); undefined when there is no such stock. */
export function updateStockSheet(
  db: Kysely<Database>,
  id: number,
  sheet: UpdateStockSheetRequest,
): Promise<StockRow | undefined> {
  return db
    .updateTable('stocks')
    .set({
      notes: sheet.notes,
      recommended_ei: sheet.recommendedEi,
      latitude_under_stops: sheet.latitudeUnderStops,
      latitude_over_stops: sheet.latitudeOverStops,
      push_pull_notes: sheet.pushPullNotes,
      reciprocity_exponent: sheet.reciprocityExponent,
      handling_notes: sheet.handlingNotes,
    })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirst();
}

export function toStock(row: StockRow): Stock {
  return {
    id: row.id,
    name: row.name,
    maker: row.maker,
    iso: row.iso,
    process: row.process as FilmProcess,
    masked: row.masked === 1,
    baseMaterial: row.base_material,
    frameFormats: JSON.parse(row.frame_formats) as string[],
    notes: row.notes,
    recommendedEi: row.recommended_ei,
    latitudeUnderStops: row.latitude_under_stops,
    latitudeOverStops: row.latitude_over_stops,
    pushPullNotes: row.push_pull_notes,
    reciprocityExponent: row.reciprocity_exponent,
    handlingNotes: row.handling_notes,
    createdAt: row.created_at,
  };
}
