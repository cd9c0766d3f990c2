import { createScannerRequestSchema, staffRoles, updateScannerRequestSchema } from '@clearbase/contracts';
import { z } from 'zod';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { recordCatalogueAudit } from '../profiles/record-catalogue-audit';
import { findScannerById, insertScanner, listScanners, toScanner, updateScanner } from './scanner-repository';

const scannerIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive scanner id') });

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
            throw new AppError('scanner-name-taken', 409, `A scanner named ${body.name} already exists.`, [
              { path: 'body.name', message: 'Another scanner has this name' },
            ]);
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

  api.define(
    {
      method: 'patch',
      path: '/api/scanners/:id',
      roles: ['manager', 'admin'],
      params: scannerIdParams,
      body: updateScannerRequestSchema,
      summary: 'Change a scanner and its input profile',
    },
    async (_req, res, { params, body, user }) => {
      const scanner = await db.transaction().execute(async (trx) => {
        const before = await findScannerById(trx, params.id);
        if (!before) throw new AppError('scanner-not-found', 404, `No scanner with id ${params.id}.`);
        let row;
        try {
          row = await updateScanner(trx, params.id, body);
        } catch (err) {
          if (isUniqueViolation(err))
            throw new AppError('scanner-name-taken', 409, `A scanner named ${body.name} already exists.`, [
              { path: 'body.name', message: 'Another scanner has this name' },
            ]);
          throw err;
        }
        const updated = toScanner(row!);
        await recordCatalogueAudit(trx, {
          at: clock.now(),
          actor: user!,
          action: 'scanner-updated',
          target: `scanner:${params.id}`,
          before: toScanner(before),
          after: updated,
        });
        return updated;
      });
      res.json({ scanner });
    },
  );
};
