import { neutralAdjustments, type CreateRollRequest, type Roll, type User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { currentPublishedVersion, findRollById, insertRoll, toRoll } from '../rolls/roll-repository';
import { findScannerById } from '../scanners/scanner-repository';
import { findStockById } from '../stocks/stock-repository';
import { recordOrderAudit } from './record-order-audit';

/**
 * Adds one roll to an order, pinned to its stock's current published profile version, and audits it. Run it in the
 * order's transaction: a refused roll throws before anything of it is written, and the caller's rollback takes the
 * rest back.
 *
 * Throws AppError `stock-not-found` / `scanner-not-found` (404) or `no-published-profile` (422), each naming the field
 * at `path` (`body` for a roll sent alone, `body.rolls.2` for the third roll of a new order).
 *
 * @example
 * const roll = await addRollToOrder(trx, { orderId, request, actor: user, at, path: 'body.rolls.0' });
 */
export async function addRollToOrder(
  db: Kysely<Database>,
  options: { orderId: number; request: CreateRollRequest; actor: User; at: Date; path: string },
): Promise<Roll> {
  const { request, path } = options;
  const stock = await findStockById(db, request.stockId);
  if (!stock) {
    throw new AppError('stock-not-found', 404, `No stock with id ${request.stockId}.`, [
      { path: `${path}.stockId`, message: 'No such stock' },
    ]);
  }
  if (request.scannerId !== null && !(await findScannerById(db, request.scannerId))) {
    throw new AppError('scanner-not-found', 404, `No scanner with id ${request.scannerId}.`, [
      { path: `${path}.scannerId`, message: 'No such scanner' },
    ]);
  }
  const pinned = await currentPublishedVersion(db, stock.id, request.scannerId);
  if (!pinned) {
    throw new AppError(
      'no-published-profile',
      422,
      `${stock.name} has no published profile version yet; publish one before adding rolls of it.`,
      [{ path: `${path}.stockId`, message: `${stock.name} cannot be ordered yet` }],
    );
  }
  const row = await insertRoll(db, {
    orderId: options.orderId,
    stockId: stock.id,
    ei: request.ei,
    pushPull: request.pushPull,
    format: request.format,
    scannerId: request.scannerId,
    profileVersionId: pinned.id,
    adjustments: neutralAdjustments,
    at: options.at,
  });
  const roll = toRoll((await findRollById(db, row.id))!);
  await recordOrderAudit(db, {
    at: options.at,
    actor: options.actor,
    action: 'roll-created',
    target: `roll:${row.id}`,
    details: { after: roll },
  });
  return roll;
}
