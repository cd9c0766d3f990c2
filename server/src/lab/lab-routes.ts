import { labSchema } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';
import { readLab, writeLab } from './lab-settings';

/** The lab's name and address (public) and its settings (admins). */
export const labRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/lab', roles: 'public', summary: 'The lab’s name and address' },
    async (_req, res) => {
      res.json(await readLab(db));
    },
  );

  api.define(
    {
      method: 'put',
      path: '/api/lab',
      roles: ['admin'],
      body: labSchema,
      summary: 'Rename the lab, change its address, or take payment on collection',
    },
    async (_req, res, { body, user }) => {
      res.json(await writeLab({ db, clock }, user!, body));
    },
  );
};
