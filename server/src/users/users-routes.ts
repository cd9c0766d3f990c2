import { createUserRequestSchema, updateUserRequestSchema } from '@clearbase/contracts';
import { z } from 'zod';
import type { RouteModule } from '../http/route-module';
import { createUsersService } from './users-service';

const userIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive user id') });

/** The admin's accounts of every role (the rules are in users-service.ts). */
export const usersRoutes: RouteModule = (api, { db, clock }) => {
  const users = createUsersService({ db, clock });

  api.define(
    { method: 'get', path: '/api/users', roles: ['admin'], summary: 'All accounts' },
    async (_req, res) => {
      res.json({ users: await users.list() });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/users',
      roles: ['admin'],
      body: createUserRequestSchema,
      summary: 'Create an account',
    },
    async (_req, res, { body, user }) => {
      res.status(201).json(await users.create(user!, body));
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/users/:id',
      roles: ['admin'],
      params: userIdParams,
      body: updateUserRequestSchema,
      summary: 'Rename, change role, disable or enable an account',
    },
    async (_req, res, { params, body, user }) => {
      res.json({ user: await users.update(user!, params.id, body) });
    },
  );
};
