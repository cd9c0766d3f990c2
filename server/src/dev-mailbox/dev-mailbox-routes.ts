import { caughtMailIdParamsSchema } from '@clearbase/contracts';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { caughtMailFolder, listCaughtMail, readCaughtMail } from './caught-mail-store';

/** The development mailbox: what the local mail catcher caught, for admins, only while the local fakes run. */
export const devMailboxRoutes: RouteModule = (api, { config }) => {
  const folder = caughtMailFolder(config.dataDir);
  const requireLocalFakes = () => {
    if (!config.localFakes) {
      throw new AppError(
        'no-dev-mailbox',
        404,
        'The development mailbox exists only while the local fakes run (LOCAL_FAKES=true).',
      );
    }
  };

  api.define(
    { method: 'get', path: '/api/dev/mailbox', roles: ['admin'], summary: 'Mail the local catcher caught' },
    async (_req, res) => {
      requireLocalFakes();
      res.json({ messages: await listCaughtMail(folder) });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/dev/mailbox/:id',
      roles: ['admin'],
      params: caughtMailIdParamsSchema,
      summary: 'One caught message with its text and sanitised HTML',
    },
    async (_req, res, { params }) => {
      requireLocalFakes();
      const mail = await readCaughtMail(folder, params.id);
      if (!mail) throw new AppError('caught-mail-not-found', 404, `No caught message ${params.id}.`);
      res.json(mail);
    },
  );
};
