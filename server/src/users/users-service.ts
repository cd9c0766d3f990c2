import type { CreateUserRequest, UpdateUserRequest, User, UserRecord } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import { dropUserSessions } from '../auth/kysely-session-store';
import { generateTemporaryPassword, hashPassword } from '../auth/password-hash';
import type { Clock } from '../clock';
import type { Database, UserRowUpdate } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import {
  findUserByEmail,
  findUserById,
  insertUser,
  listUsers,
  toUserRecord,
  updateUser,
} from './user-repository';

const emailTaken = (email: string) =>
  new AppError('email-taken', 409, `An account with the e-mail ${email} already exists.`);

/**
 * The admin's accounts of every role: create, rename, change role, disable and enable, each audited. A disabled
 * account, or one whose role changed, signs in again; an admin can neither disable nor demote their own account.
 *
 * @example
 * const users = createUsersService({ db, clock });
 * const { user, temporaryPassword } = await users.create(admin, { email: 'new@lab.test', name: 'New', role: 'operator' });
 */
export function createUsersService({ db, clock }: { db: Kysely<Database>; clock: Clock }) {
  return {
    async list(): Promise<UserRecord[]> {
      return (await listUsers(db)).map(toUserRecord);
    },

    /** Creates an account; without a password, a temporary one is made and returned once. */
    async create(
      actor: User,
      body: CreateUserRequest,
    ): Promise<{ user: UserRecord; temporaryPassword?: string }> {
      if (await findUserByEmail(db, body.email)) throw emailTaken(body.email);
      const temporaryPassword = body.password ? undefined : generateTemporaryPassword();
      const passwordHash = await hashPassword(body.password ?? temporaryPassword!);
      const row = await db
        .transaction()
        .execute(async (trx) => {
          const created = await insertUser(trx, {
            email: body.email,
            name: body.name,
            role: body.role,
            password_hash: passwordHash,
            created_at: clock.now().toISOString(),
            last_sign_in_at: null,
            password_changed_at: null,
          });
          await recordAudit(trx, {
            at: clock.now(),
            actor,
            action: 'user-created',
            target: `user:${created.id}`,
            details: { email: created.email, role: created.role },
          });
          return created;
        })
        .catch((err: unknown) => {
          throw isUniqueViolation(err) ? emailTaken(body.email) : err;
        });
      return { user: toUserRecord(row), ...(temporaryPassword ? { temporaryPassword } : {}) };
    },

    /** Renames, changes the role of, disables or enables an account; each change is audited on its own. */
    async update(actor: User, id: number, body: UpdateUserRequest): Promise<UserRecord> {
      const existing = await findUserById(db, id);
      if (!existing) throw new AppError('user-not-found', 404, `No user with id ${id}.`);
      if (existing.id === actor.id) {
        if (body.disabled === true) {
          throw new AppError('cannot-disable-self', 409, 'You cannot disable your own account.');
        }
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
      if (Object.keys(changes).length === 0) return toUserRecord(existing);
      const updated = await db.transaction().execute(async (trx) => {
        const row = (await updateUser(trx, existing.id, changes))!;
        const target = `user:${existing.id}`;
        const at = clock.now();
        if (changes.name !== undefined) {
          await recordAudit(trx, {
            at,
            actor,
            action: 'user-renamed',
            target,
            details: { from: existing.name, to: row.name },
          });
        }
        if (changes.role !== undefined) {
          await recordAudit(trx, {
            at,
            actor,
            action: 'user-role-changed',
            target,
            details: { from: existing.role, to: row.role },
          });
        }
        if (changes.disabled !== undefined) {
          await recordAudit(trx, {
            at,
            actor,
            action: row.disabled ? 'user-disabled' : 'user-enabled',
            target,
            details: { email: row.email },
          });
        }
        // a disabled account, or one whose role changed, signs in again
        if (changes.disabled === 1 || changes.role !== undefined) await dropUserSessions(trx, existing.id);
        return row;
      });
      return toUserRecord(updated);
    },
  };
}
