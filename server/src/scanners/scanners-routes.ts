import { createScannerRequestSchema, staffRoles } from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { isUniqueViolation } from '../stocks/is-unique-violation';
import { insertScanner, listScanners, toScanner } from './scanner-repository';

export const scannersRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/scanners', roles: staffRoles, summary: 'Scanners and their input profiles' },
    async (_req, res) => {
      res.json({ scanners: (await listScanners(db)).map(toScanner) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/scanners',
      roles: ['manager', 'admin'],
      body: createScannerRequestSchema,
      summary: 'Add a scanner',
    },
    async (_req, res, { body, user }) => {
      const scanner = await db.transaction().execute(async (trx) => {
        let row;
        try {
          row = await insertScanner(trx, body, clock.now());
        } catch (err) {
          if (isUniqueViolation(err))
            throw new AppError('scanner-name-taken', 409, `A scanner named ${body.name} already exists.`);
          throw err;
        }
        const created = toScanner(row);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'scanner-created',
          target: `scanner:${row.id}`,
          before: null,
          after: created,
        });
        return created;
      });
      res.status(201).json({ scanner });
    },
  );
};
