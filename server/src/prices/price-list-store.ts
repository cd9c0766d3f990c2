import { priceListSchema, type PriceList } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';

const settingsKey = 'price-list';

/** Used until a manager saves a price list: invented figures to start from (our choice). */
export const starterPriceList: PriceList = {
  currency: 'EUR',
  develop: [
    { format: '135-24', process: 'C-41', amountMinor: 1000 },
    { format: '135-36', process: 'C-41', amountMinor: 1200 },
    { format: '120', process: 'C-41', amountMinor: 1200 },
  ],
  scan: [
    { size: 'standard', amountMinor: 800 },
    { size: 'large', amountMinor: 1500 },
    { size: 'full', amountMinor: 2200 },
  ],
  pushPullPerStopMinor: 300,
  returnByPostMinor: 450,
};

/** The lab's price list from settings; the starter list when none was saved or the saved one no longer parses. */
export async function readPriceList(db: Kysely<Database>): Promise<PriceList> {
  const row = await db
    .selectFrom('settings')
    .select('value')
    .where('key', '=', settingsKey)
    .executeTakeFirst();
  if (!row) return starterPriceList;
  try {
    const parsed = priceListSchema.safeParse(JSON.parse(row.value));
    return parsed.success ? parsed.data : starterPriceList;
  } catch {
    return starterPriceList;
  }
}

export async function writePriceList(db: Kysely<Database>, list: PriceList): Promise<void> {
  const value = JSON.stringify(list);
  await db
    .insertInto('settings')
    .values({ key: settingsKey, value })
    .onConflict((oc) => oc.column('key').doUpdateSet({ value }))
    .execute();
}
