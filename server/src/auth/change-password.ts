import type { User } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { findUserById, updateUser } from '../users/user-repository';
import { dropUserSessions } from './kysely-session-store';
import { hashPassword, verifyPassword } from './password-hash';

/**
 * Changes a signed-in user's password after checking the current one; every other session of the user ends, the one
 * asking (`keepSid`) stays signed in.
 *
 * @example
 * await changePassword({ db, clock }, user, { currentPassword, newPassword }, req.sessionID);
 */
export async function changePassword(
  { db, clock }: { db: Kysely<Database>; clock: Clock },
  user: User,
  body: { currentPassword: string; newPassword: string },
  keepSid: string,
): Promise<void> {
  const row = await findUserById(db, user.id);
  if (!row || !(await verifyPassword(body.currentPassword, row.password_hash))) {
    throw new AppError('wrong-current-password', 400, 'The current password is not right.', [
      { path: 'body.currentPassword', message: 'The current password is not right.' },
    ]);
  }
  const now = clock.now().toISOString();
  const passwordHash = await hashPassword(body.newPassword);
  await db.transaction().execute(async (trx) => {
    await updateUser(trx, row.id, { password_hash: passwordHash, password_changed_at: now });
    await dropUserSessions(trx, row.id, keepSid);
    await recordAudit(trx, {
      at: clock.now(),
      actor: user,
      action: 'password-changed',
      target: `user:${row.id}`,
    });
  });
}
