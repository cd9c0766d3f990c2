import { roles, type Role } from '@clearbase/contracts';
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeRegistryOf } from '../app';
import { declaredRoute, isAllowed, type RegisteredRoute } from '../http/define-route';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  type Client,
  type TestApp,
} from '../test-support/test-app';

interface Layer {
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: unknown }[] };
  handle?: { stack?: Layer[] };
}

/** Every route registered on the app's Express router, nested routers included. */
function expressRoutes(app: Express): { key: string; declared: boolean }[] {
  const found: { key: string; declared: boolean }[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        const last = layer.route.stack.at(-1)?.handle as Record<symbol, unknown> | undefined;
        for (const method of Object.keys(layer.route.methods)) {
          found.push({
            key: `${method.toUpperCase()} ${layer.route.path}`,
            declared: Boolean(last?.[declaredRoute]),
          });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack);
  return found;
}

const samplePath = (path: string) => path.replace(/:[A-Za-z]+/g, '1');
const key = (r: RegisteredRoute) => `${r.method.toUpperCase()} ${r.path}`;

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  for (const role of roles) await addUser(t.db, role, `${role}@lab.test`);
});
afterAll(() => t.close());

describe('route declarations', () => {
  it('registers every /api route through the route helper, with its roles on record', () => {
    const registry = new Set(routeRegistryOf(t.app).map(key));
    const routes = expressRoutes(t.app).filter((r) => r.key.split(' ')[1]!.startsWith('/api'));
    expect(routes.length).toBeGreaterThan(0);
    for (const r of routes) {
      expect(r.declared, `${r.key} was not registered through api.define`).toBe(true);
      expect(registry.has(r.key), `${r.key} is missing from the route registry`).toBe(true);
    }
  });
});

describe('authorization matrix', () => {
  const who: (Role | 'anonymous')[] = ['anonymous', ...roles];

  it('answers every declared route as its roles say, for every role and for anonymous visitors', async () => {
    const failures: string[] = [];
    const registry = routeRegistryOf(t.app);
    // one client per caller, signed in again only when a route (sign-out, say) ended its session
    const clients = new Map<Role | 'anonymous', Client>();
    const clientFor = async (caller: Role | 'anonymous'): Promise<Client> => {
      const known = clients.get(caller);
      if (known && (caller === 'anonymous' || (await known.get('/api/auth/me')).status === 200)) return known;
      const fresh =
        caller === 'anonymous' ? await client(t.app) : await signedIn(t.app, `${caller}@lab.test`);
      clients.set(caller, fresh);
      return fresh;
    };
    for (const route of registry) {
      for (const caller of who) {
        const c = await clientFor(caller);
        const res = await c.send(
          route.method,
          samplePath(route.path),
          route.method === 'get' ? undefined : {},
        );
        const allowed = isAllowed(
          route.roles,
          caller === 'anonymous' ? undefined : ({ role: caller } as never),
        );
        const expected = allowed ? 'neither 401 nor 403' : caller === 'anonymous' ? '401' : '403';
        const ok = allowed
          ? res.status !== 401 && res.status !== 403
          : res.status === (caller === 'anonymous' ? 401 : 403);
        if (!ok) failures.push(`${key(route)} as ${caller}: expected ${expected}, got ${res.status}`);
      }
    }
    expect(failures).toEqual([]);
  });

  it('reaches no route when a path is spelt in upper case, for every role', async () => {
    const failures: string[] = [];
    for (const caller of who) {
      const c = caller === 'anonymous' ? await client(t.app) : await signedIn(t.app, `${caller}@lab.test`);
      for (const route of routeRegistryOf(t.app)) {
        const path = samplePath(route.path).toUpperCase();
        const res = await c.send(route.method, path, route.method === 'get' ? undefined : {});
        if (res.status !== 404)
          failures.push(`${route.method.toUpperCase()} ${path} as ${caller}: ${res.status}`);
        // without the token an unsafe request is refused before routing, whatever its path
        if (route.method !== 'get') {
          const bare = await c.agent[route.method](path).send({});
          if (bare.status !== 403)
            failures.push(`${route.method.toUpperCase()} ${path} as ${caller} without token: ${bare.status}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });

  it('covers the sign-in, users and audit routes', () => {
    const keys = routeRegistryOf(t.app).map(key);
    expect(keys).toEqual(
      expect.arrayContaining([
        'POST /api/auth/login',
        'GET /api/auth/me',
        'GET /api/users',
        'PATCH /api/users/:id',
        'GET /api/audit',
      ]),
    );
  });
});
