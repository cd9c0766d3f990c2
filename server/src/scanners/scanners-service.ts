import type { CreateScannerRequest, Scanner, UpdateScannerRequest, User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { findScannerById, insertScanner, listScanners, toScanner, updateScanner } from './scanner-repository';

function nameTaken(name: string | undefined): AppError {
  return new AppError('scanner-name-taken', 409, `A scanner named ${name} already exists.`, [
    { path: 'body.name', message: 'Another scanner has this name' },
  ]);
}

/**
 * The lab's scanners and their input profiles; every change is audited with the scanner before and after.
 *
 * @example
 * const scanners = createScannersService({ db, clock });
 * await scanners.update(manager, 3, { blackLevel: 256 });
 */
export function createScannersService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    async list(): Promise<Scanner[]> {
      return (await listScanners(db)).map(toScanner);
    },

    async create(actor: User, body: CreateScannerRequest): Promise<Scanner> {
      return db.transaction().execute(async (trx) => {
        const row = await insertScanner(trx, body, clock.now()).catch((err: unknown) => {
          throw isUniqueViolation(err) ? nameTaken(body.name) : err;
        });
        const created = toScanner(row);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor,
          action: 'scanner-created',
          target: `scanner:${row.id}`,
          before: null,
          after: created,
        });
        return created;
      });
    },

    async update(actor: User, id: number, body: UpdateScannerRequest): Promise<Scanner> {
      return db.transaction().execute(async (trx) => {
        const before = await findScannerById(trx, id);
        if (!before) throw new AppError('scanner-not-found', 404, `No scanner with id ${id}.`);
        const row = await updateScanner(trx, id, body).catch((err: unknown) => {
          throw isUniqueViolation(err) ? nameTaken(body.name) : err;
        });
        const updated = toScanner(row!);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor,
          action: 'scanner-updated',
          target: `scanner:${id}`,
          before: toScanner(before),
          after: updated,
        });
        return updated;
      });
    },
  };
}
