import {
  createScannerRequestSchema,
  managerRoles,
  staffRoles,
  updateScannerRequestSchema,
} from '@clearbase/contracts';
import { z } from 'zod';
import type { RouteModule } from '../http/route-module';
import { createScannersService } from './scanners-service';

const scannerIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive scanner id') });

/** The lab's scanners (the rules are in scanners-service.ts). */
export const scannersRoutes: RouteModule = (api, { db, clock }) => {
  const scanners = createScannersService({ db, clock });

  api.define(
    { method: 'get', path: '/api/scanners', roles: staffRoles, summary: 'Scanners and their input profiles' },
    async (_req, res) => {
      res.json({ scanners: await scanners.list() });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/scanners',
      roles: managerRoles,
      body: createScannerRequestSchema,
      summary: 'Add a scanner',
    },
    async (_req, res, { body, user }) => {
      res.status(201).json({ scanner: await scanners.create(user!, body) });
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/scanners/:id',
      roles: managerRoles,
      params: scannerIdParams,
      body: updateScannerRequestSchema,
      summary: 'Change a scanner and its input profile',
    },
    async (_req, res, { params, body, user }) => {
      res.json({ scanner: await scanners.update(user!, params.id, body) });
    },
  );
};
