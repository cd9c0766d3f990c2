import type { ScannerProfile, User } from '@clearbase/contracts';
import { LINEAR_SCANNER } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { isStaff } from '../orders/order-access';
import { findScannerById } from '../scanners/scanner-repository';
import { findRollById, type RollListRow } from './roll-repository';

export function rollNotFound(id: number): AppError {
  return new AppError('roll-not-found', 404, `No roll with id ${id}.`);
}

/** The roll if this user may see it; another customer's roll answers the same 404 as a missing one. */
export async function loadRollFor(db: Kysely<Database>, id: number, user: User): Promise<RollListRow> {
  const roll = await findRollById(db, id);
  if (!roll) throw rollNotFound(id);
  if (!isStaff(user)) {
    const order = await db
      .selectFrom('orders')
      .select('customer_id')
      .where('id', '=', roll.order_id)
      .executeTakeFirst();
    if (order?.customer_id !== user.id) throw rollNotFound(id);
  }
  return roll;
}

/** The input profile of the roll's scanner; a linear scanner when the roll names none. */
export async function scannerProfileOf(
  db: Kysely<Database>,
  scannerId: number | null,
): Promise<ScannerProfile> {
  if (scannerId === null) return LINEAR_SCANNER;
  const scanner = await findScannerById(db, scannerId);
  return scanner ? (JSON.parse(scanner.input_profile) as ScannerProfile) : LINEAR_SCANNER;
}
