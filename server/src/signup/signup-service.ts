import type { CounterCustomerRequest, SignupRequest, User, UserRecord } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { recordAudit } from '../audit/audit-log';
import { dropUserSessions } from '../auth/kysely-session-store';
import { generateTemporaryPassword, hashPassword } from '../auth/password-hash';
import type { Clock } from '../clock';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import {
  findUserByEmail,
  findUserById,
  insertUser,
  listCustomers,
  toUserRecord,
  updateUser,
} from '../users/user-repository';
import { hashLinkToken } from './link-token';
import { createMailedLinks, openLink } from './mailed-links';
import {
  claimPasswordToken,
  deletePendingSignup,
  findPasswordToken,
  findPendingSignupByEmail,
  findPendingSignupByToken,
  renewPendingSignupToken,
  upsertPendingSignup,
  usePasswordTokens,
} from './signup-repository';

export interface SignupDeps {
  db: Kysely<Database>;
  clock: Clock;
  config: Config;
}

const emailTaken = (email: string, next = '') =>
  new AppError('email-taken', 409, `An account with the e-mail ${email} already exists.${next}`);

/**
 * Customer accounts: sign-up with a confirmed e-mail address, password reset by e-mail, and accounts staff open at
 * the counter.
 *
 * A sign-up makes no account: it waits in `pending_signups` until the link in the verification mail is followed, so
 * a customer cannot sign in, and so cannot order, before the address is confirmed. Whatever starts with an address
 * does the same visible work whether an account exists or not.
 *
 * @example
 * const signup = createSignupService({ db, clock, config });
 * await signup.signUp({ email: 'wren@example.test', name: 'Wren Hollis', password: 'a-long-new-password' });
 */
export function createSignupService({ db, clock, config }: SignupDeps) {
  const links = createMailedLinks({ clock, config });

  return {
    /** Mails a confirmation link to a new address, or a reminder to sign in to one that has an account. */
    async signUp(body: SignupRequest): Promise<void> {
      // hashed in every case, so a known address answers no faster than a new one
      const passwordHash = await hashPassword(body.password);
      const now = clock.now();
      const existing = await findUserByEmail(db, body.email);
      await db.transaction().execute(async (trx) => {
        if (existing) {
          await enqueueTemplatedMail(
            trx,
            existing.email,
            'already-registered',
            { name: existing.name, signInUrl: links.signInUrl, resetUrl: links.forgotPasswordUrl },
            now,
          );
          return;
        }
        const { hash, expiresAt } = await links.mailVerifyLink(trx, body, now);
        await upsertPendingSignup(trx, {
          email: body.email,
          name: body.name,
          password_hash: passwordHash,
          token_hash: hash,
          expires_at: expiresAt,
          created_at: now.toISOString(),
        });
      });
    },

    /** Mails a pending sign-up's link again (the old one stops working); nothing when none waits. */
    async resendVerifyLink(email: string): Promise<void> {
      const pending = await findPendingSignupByEmail(db, email);
      if (!pending) return;
      await db.transaction().execute(async (trx) => {
        const { hash, expiresAt } = await links.mailVerifyLink(trx, pending, clock.now());
        await renewPendingSignupToken(trx, pending.id, hash, expiresAt);
      });
    },

    /** Follows a confirmation link: makes the customer account from the pending sign-up. */
    async verify(token: string): Promise<UserRecord> {
      const pending = openLink(await findPendingSignupByToken(db, hashLinkToken(token)), clock.now(), {
        invalid:
          'This link is not valid, or was already used. If you have confirmed your address, sign in; otherwise sign up again.',
        expired: 'This link has expired. Ask for a new one or sign up again.',
      });
      const row = await db
        .transaction()
        .execute(async (trx) => {
          const created = await insertUser(trx, {
            email: pending.email,
            name: pending.name,
            role: 'customer',
            password_hash: pending.password_hash,
            created_at: clock.now().toISOString(),
            last_sign_in_at: null,
            password_changed_at: null,
          });
          await deletePendingSignup(trx, pending.id);
          await recordAudit(trx, {
            at: clock.now(),
            actor: null,
            action: 'user-created',
            target: `user:${created.id}`,
            details: { email: created.email, role: created.role, via: 'sign-up' },
          });
          return created;
        })
        .catch((err: unknown) => {
          throw isUniqueViolation(err) ? emailTaken(pending.email, ' Sign in.') : err;
        });
      return toUserRecord(row);
    },

    /** Mails a reset link to an enabled account with this address; nothing otherwise. */
    async mailResetLinkIfKnown(email: string): Promise<void> {
      const user = await findUserByEmail(db, email);
      if (!user || user.disabled) return;
      await db.transaction().execute((trx) => links.mailPasswordLink(trx, user, 'reset', clock.now()));
    },

    /** Sets a new password with a reset or welcome link; every session of the account ends. */
    async confirmPasswordReset(token: string, newPassword: string): Promise<UserRecord> {
      const found = await findPasswordToken(db, hashLinkToken(token));
      const now = clock.now().toISOString();
      const open = openLink(found?.used_at === null ? found : undefined, clock.now(), {
        invalid: 'This link is not valid or was already used. Ask for a new one from the sign-in page.',
        expired: 'This link has expired. Ask for a new one from the sign-in page.',
      });
      const user = await findUserById(db, open.user_id);
      if (!user || user.disabled) {
        throw new AppError('link-invalid', 400, 'This link is not valid. Ask the lab for help.');
      }
      const passwordHash = await hashPassword(newPassword);
      await db.transaction().execute(async (trx) => {
        // a token used concurrently loses here: only one claim finds it open
        if (!(await claimPasswordToken(trx, open.id, now))) {
          throw new AppError('link-invalid', 400, 'This link was already used. Ask for a new one.');
        }
        await usePasswordTokens(trx, user.id, now);
        await updateUser(trx, user.id, { password_hash: passwordHash, password_changed_at: now });
        await dropUserSessions(trx, user.id);
        await recordAudit(trx, {
          at: clock.now(),
          actor: null,
          action: 'password-changed',
          target: `user:${user.id}`,
          details: { via: open.purpose === 'welcome' ? 'welcome-link' : 'reset-link' },
        });
      });
      return toUserRecord(user);
    },

    /** Every customer account, by name, for staff at the counter. */
    async customers(): Promise<UserRecord[]> {
      return (await listCustomers(db)).map(toUserRecord);
    },

    /** Opens a customer account at the counter; the customer chooses a password from the mailed link. */
    async openCounterAccount(actor: User, body: CounterCustomerRequest): Promise<UserRecord> {
      if (await findUserByEmail(db, body.email)) throw emailTaken(body.email);
      // nobody knows this password: the customer sets their own through the link
      const unusableHash = await hashPassword(generateTemporaryPassword() + generateTemporaryPassword());
      const now = clock.now();
      const row = await db
        .transaction()
        .execute(async (trx) => {
          const created = await insertUser(trx, {
            email: body.email,
            name: body.name,
            role: 'customer',
            password_hash: unusableHash,
            created_at: now.toISOString(),
            last_sign_in_at: null,
            password_changed_at: null,
          });
          await links.mailPasswordLink(trx, created, 'welcome', now);
          await recordAudit(trx, {
            at: now,
            actor,
            action: 'user-created',
            target: `user:${created.id}`,
            details: { email: created.email, role: created.role, via: 'counter' },
          });
          return created;
        })
        .catch((err: unknown) => {
          throw isUniqueViolation(err) ? emailTaken(body.email) : err;
        });
      return toUserRecord(row);
    },
  };
}

export type SignupService = ReturnType<typeof createSignupService>;
