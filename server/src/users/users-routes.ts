import { createUserRequestSchema, updateUserRequestSchema } from '@clearbase/contracts';
import { z } from 'zod';
import { recordAudit } from '../audit/audit-log';
import { dropUserSessions } from '../auth/kysely-session-store';
import { generateTemporaryPassword, hashPassword } from '../auth/password-hash';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import type { UserRowUpdate } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import {
  findUserByEmail,
  findUserById,
  insertUser,
  listUsers,
  toUserRecord,
  updateUser,
} from './user-repository';

const userIdParams = z.object({ id: z.coerce.number().int().positive('Expected a positive user id') });

export const usersRoutes: RouteModule = (api, { db, clock }) => {
  api.define(
    { method: 'get', path: '/api/users', roles: ['admin'], summary: 'All accounts' },
    async (_req, res) => {
      res.json({ users: (await listUsers(db)).map(toUserRecord) });
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
    async (_req, res, { body, user: actor }) => {
      if (await findUserByEmail(db, body.email)) {
        throw new AppError('email-taken', 409, `An account with the e-mail ${body.email} already exists.`);
      }
      const temporaryPassword = body.password ? undefined : generateTemporaryPassword();
      const now = clock.now().toISOString();
      let row;
      try {
        row = await insertUser(db, {
          email: body.email,
          name: body.name,
          role: body.role,
          password_hash: await hashPassword(body.password ?? temporaryPassword!),
          created_at: now,
          last_sign_in_at: null,
          password_changed_at: null,
        });
      } catch (err) {
        if (isUniqueViolation(err)) {
          throw new AppError('email-taken', 409, `An account with the e-mail ${body.email} already exists.`);
        }
        throw err;
      }
      await recordAudit(db, {
        at: clock.now(),
        actor: actor!,
        action: 'user-created',
        target: `user:${row.id}`,
        details: { email: row.email, role: row.role },
      });
      res.status(201).json({ user: toUserRecord(row), ...(temporaryPassword ? { temporaryPassword } : {}) });
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
    async (_req, res, { params, body, user: actor }) => {
      const existing = await findUserById(db, params.id);
      if (!existing) throw new AppError('user-not-found', 404, `No user with id ${params.id}.`);
      if (existing.id === actor!.id) {
        if (body.disabled === true)
          throw new AppError('cannot-disable-self', 409, 'You cannot disable your own account.');
        if (body.role && body.role !== existing.role) {
          throw new AppError(
            'cannot-change-own-role',
            409,
            'You cannot change your own role; ask another admin.',
          );
        }
      }
      const changes: UserRowUpdate = {};
      if (body.name !== undefined && body.name !== existing.name) changes.name = body.name;
      if (body.role !== undefined && body.role !== existing.role) changes.role = body.role;
      const disabled = body.disabled === undefined ? undefined : body.disabled ? 1 : 0;
      if (disabled !== undefined && disabled !== existing.disabled) changes.disabled = disabled;
      if (Object.keys(changes).length === 0) {
        res.json({ user: toUserRecord(existing) });
        return;
      }
      const updated = await db.transaction().execute(async (trx) => {
        const row = (await updateUser(trx, existing.id, changes))!;
        const target = `user:${existing.id}`;
        const at = clock.now();
        if (changes.name !== undefined) {
          await recordAudit(trx, {
            at,
            actor: actor!,
            action: 'user-renamed',
            target,
            details: { from: existing.name, to: row.name },
          });
        }
        if (changes.role !== undefined) {
          await recordAudit(trx, {
            at,
            actor: actor!,
            action: 'user-role-changed',
            target,
            details: { from: existing.role, to: row.role },
          });
        }
        if (changes.disabled !== undefined) {
          await recordAudit(trx, {
            at,
            actor: actor!,
            action: row.disabled ? 'user-disabled' : 'user-enabled',
            target,
            details: { email: row.email },
          });
        }
        // a disabled account, or one whose role changed, signs in again
        if (changes.disabled === 1 || changes.role !== undefined) await dropUserSessions(trx, existing.id);
        return row;
      });
      res.json({ user: toUserRecord(updated) });
    },
  );
};
