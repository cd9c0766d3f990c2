import type { RouteModule } from '../http/route-module';

export const healthRoutes: RouteModule = (api) => {
  api.define({ method: 'get', path: '/api/health', roles: 'public', summary: 'Liveness' }, (_req, res) => {
    res.json({ ok: true });
  });
};
