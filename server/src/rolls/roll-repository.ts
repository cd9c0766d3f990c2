import type { Adjustments, MeasuredBase, PixelRegion, Roll, RollStatus } from '@clearbase/contracts';
import { readStoredAdjustments } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { RollRow } from './roll-tables';

/** A roll row with its stock's name, the pinned version's number and its number of frames. */
export type RollListRow = RollRow & { stock_name: string; profile_version: number; frame_count: number };

function rollList(db: Kysely<Database>) {
  return db
    .selectFrom('rolls')
    .innerJoin('stocks', 'stocks.id', 'rolls.stock_id')
    .innerJoin('profile_versions', 'profile_versions.id', 'rolls.profile_version_id')
    .selectAll('rolls')
    .select(['stocks.name as stock_name', 'profile_versions.version as profile_version'])
    .select((eb) =>
      eb
        .selectFrom('frames')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('frames.roll_id', '=', 'rolls.id')
        .as('frame_count'),
    );
}

export async function findRollById(db: Kysely<Database>, id: number): Promise<RollListRow | undefined> {
  const row = await rollList(db).where('rolls.id', '=', id).executeTakeFirst();
  return row ? { ...row, frame_count: Number(row.frame_count ?? 0) } : undefined;
}

export async function listRollsOfOrder(db: Kysely<Database>, orderId: number): Promise<RollListRow[]> {
  const rows = await rollList(db).where('rolls.order_id', '=', orderId).orderBy('rolls.id').execute();
  return rows.map((r) => ({ ...r, frame_count: Number(r.frame_count ?? 0) }));
}

/**
 * The version a new roll of this stock is pinned to: the newest published version of the stock's profile for this
 * scanner if there is one, else of its profile for any scanner.
 */
export async function currentPublishedVersion(
  db: Kysely<Database>,
  stockId: number,
  scannerId: number | null,
): Promise<{ id: number; version: number } | undefined> {
  const rows = await db
    .selectFrom('profile_versions')
    .innerJoin('profiles', 'profiles.id', 'profile_versions.profile_id')
    .select([
      'profile_versions.id',
      'profile_versions.version',
      'profiles.scanner_id',
      'profile_versions.published_at',
    ])
    .where('profiles.stock_id', '=', stockId)
    .where('profile_versions.status', '=', 'published')
    .orderBy('profile_versions.published_at', 'desc')
    .orderBy('profile_versions.id', 'desc')
    .execute();
  const best =
    (scannerId !== null && rows.find((r) => r.scanner_id === scannerId)) ||
    rows.find((r) => r.scanner_id === null) ||
    rows[0];
  return best ? { id: best.id, version: best.version } : undefined;
}

export function insertRoll(
  db: Kysely<Database>,
  roll: {
    orderId: number;
    stockId: number;
    ei: number;
    pushPull: number;
    format: string;
    scannerId: number | null;
    profileVersionId: number;
    adjustments: Adjustments;
    at: Date;
  },
): Promise<RollRow> {
  const at = roll.at.toISOString();
  return db
    .insertInto('rolls')
    .values({
      order_id: roll.orderId,
      stock_id: roll.stockId,
      ei: roll.ei,
      push_pull: roll.pushPull,
      format: roll.format,
      scanner_id: roll.scannerId,
      profile_version_id: roll.profileVersionId,
      base_frame_id: null,
      base_region: null,
      base_measured: null,
      adjustments: JSON.stringify(roll.adjustments),
      status: 'awaiting-scans',
      created_at: at,
      updated_at: at,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

export async function setRollStatus(
  db: Kysely<Database>,
  id: number,
  status: RollStatus,
  at: Date,
): Promise<void> {
  await db.updateTable('rolls').set({ status, updated_at: at.toISOString() }).where('id', '=', id).execute();
}

/** Stores a roll's own adjustments (printer points, exposure, contrast). */
export async function saveRollAdjustments(
  db: Kysely<Database>,
  id: number,
  adjustments: Adjustments,
  at: Date,
): Promise<void> {
  await db
    .updateTable('rolls')
    .set({ adjustments: JSON.stringify(adjustments), updated_at: at.toISOString() })
    .where('id', '=', id)
    .execute();
}

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

export function toRoll(row: RollListRow): Roll {
  return {
    id: row.id,
    orderId: row.order_id,
    stockId: row.stock_id,
    stockName: row.stock_name,
    ei: row.ei,
    pushPull: row.push_pull,
    format: row.format,
    scannerId: row.scanner_id,
    profileVersionId: row.profile_version_id,
    profileVersion: row.profile_version,
    status: row.status,
    base: {
      mode: row.base_mode,
      frameId: row.base_frame_id,
      region: parse<PixelRegion>(row.base_region),
      measured: parse<MeasuredBase>(row.base_measured),
    },
    adjustments: readStoredAdjustments(row.adjustments),
    frameCount: row.frame_count,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}
