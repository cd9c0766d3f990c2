import type { ClientConfig } from '@clearbase/contracts';
import type { RouteModule } from '../http/route-module';

/** What the web app needs to know of the server's settings, e.g. whether to offer the development mailbox. */
export const clientConfigRoutes: RouteModule = (api, { config }) => {
  api.define(
    {
      method: 'get',
      path: '/api/config/client',
      roles: 'public',
      summary: 'The settings the web app shapes itself by: whether the local fakes run',
    },
    (_req, res) => {
      const body: ClientConfig = { localFakes: config.localFakes };
      res.json(body);
    },
  );
};
