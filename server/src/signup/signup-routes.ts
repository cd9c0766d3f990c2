import {
  counterCustomerRequestSchema,
  emailOnlyRequestSchema,
  passwordResetConfirmSchema,
  signupRequestSchema,
  staffRoles,
  verifyEmailRequestSchema,
  type CheckYourMailResponse,
} from '@clearbase/contracts';
import type { RequestHandler } from 'express';
import type { Kysely } from 'kysely';
import { rateLimit } from 'express-rate-limit';
import { recordAudit } from '../audit/audit-log';
import { dropUserSessions } from '../auth/kysely-session-store';
import { generateTemporaryPassword, hashPassword } from '../auth/password-hash';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { isUniqueViolation } from '../db/unique-violation';
import { AppError } from '../errors/app-error';
import { sendProblem } from '../errors/send-problem';
import { afterResponse } from '../http/after-response';
import type { RouteModule } from '../http/route-module';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import {
  findUserByEmail,
  findUserById,
  insertUser,
  toUserRecord,
  updateUser,
} from '../users/user-repository';
import { hashLinkToken, newLinkToken } from './link-token';
import {
  deletePendingSignup,
  findPasswordToken,
  findPendingSignupByEmail,
  findPendingSignupByToken,
  insertPasswordToken,
  renewPendingSignupToken,
  upsertPendingSignup,
  usePasswordTokens,
} from './signup-repository';

// 24 h to confirm an address: common practice for verification links, from memory
export const verifyLinkHours = 24;
// 60 min for a reset link: OWASP Forgot Password cheat sheet suggests a short expiry; common practice, from memory
export const resetLinkMinutes = 60;
// 72 h for a customer whose account staff opened at the counter to choose a password (our choice)
export const welcomeLinkHours = 72;

const checkYourMail = (detail: string): CheckYourMailResponse => ({ status: 'check-your-mail', detail });

/**
 * The stored row of a mailed link if it can still be used: 400 `link-invalid` when there is none (unknown, replaced
 * or used), 410 `link-expired` once it has expired. `words` says what the person can do next in each case.
 */
function openLink<T extends { expires_at: string }>(
  row: T | undefined,
  now: Date,
  words: { invalid: string; expired: string },
): T {
  if (!row) throw new AppError('link-invalid', 400, words.invalid);
  if (row.expires_at <= now.toISOString()) throw new AppError('link-expired', 410, words.expired);
  return row;
}

function mailLimiter(config: Config, what: string): RequestHandler {
  const { max, windowMs } = config.signupRateLimit;
  return rateLimit({
    windowMs,
    limit: max,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => {
      const minutes = Math.ceil(windowMs / 60_000);
      sendProblem(res, 429, `Too many ${what} requests from here. Wait ${minutes} minutes and try again.`, {
        code: 'too-many-requests',
      });
    },
  });
}

/**
 * Sign-up with a confirmed e-mail address, password reset by e-mail, and accounts staff open at the counter.
 *
 * A sign-up makes no account: it waits in `pending_signups` until the link in the verification mail is followed, so
 * a customer cannot sign in, and so cannot order, before the address is confirmed. Every request that starts with
 * an address answers the same way whether an account exists or not.
 */
export const signupRoutes: RouteModule = (api, { db, clock, config }) => {
  const link = (path: string, token: string) =>
    `${config.publicUrl}${path}?token=${encodeURIComponent(token)}`;
  const later = (ms: number) => new Date(clock.now().getTime() + ms).toISOString();

  /**
   * Mails the link that confirms a sign-up's address; the pending sign-up keeps `hash`, the returned token's hash.
   * Sign-up and resend both send it.
   */
  async function mailVerifyLink(
    trx: Kysely<Database>,
    to: { email: string; name: string },
    now: Date,
  ): Promise<{ hash: string; expiresAt: string }> {
    const { token, hash } = newLinkToken();
    await enqueueTemplatedMail(
      trx,
      to.email,
      'verify-email',
      { name: to.name, url: link('/verify-email', token), expiresHours: verifyLinkHours },
      now,
    );
    return { hash, expiresAt: later(verifyLinkHours * 3600_000) };
  }

  /**
   * Stores a single-use link to choose a password and mails it: a reset the user asked for, or the welcome of an
   * account staff opened. Both land on the same page, which sets the password with the token.
   */
  async function mailPasswordLink(
    trx: Kysely<Database>,
    user: { id: number; email: string; name: string },
    purpose: 'reset' | 'welcome',
    now: Date,
  ): Promise<void> {
    const { token, hash } = newLinkToken();
    const url = link('/reset-password', token);
    await insertPasswordToken(trx, {
      user_id: user.id,
      token_hash: hash,
      purpose,
      expires_at: later(purpose === 'reset' ? resetLinkMinutes * 60_000 : welcomeLinkHours * 3600_000),
      created_at: now.toISOString(),
    });
    if (purpose === 'reset') {
      await enqueueTemplatedMail(
        trx,
        user.email,
        'password-reset',
        { name: user.name, url, expiresMinutes: resetLinkMinutes },
        now,
      );
    } else {
      await enqueueTemplatedMail(
        trx,
        user.email,
        'account-created',
        { name: user.name, url, expiresHours: welcomeLinkHours },
        now,
      );
    }
  }

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup',
      roles: 'public',
      body: signupRequestSchema,
      before: [mailLimiter(config, 'sign-up')],
      summary: 'Sign up as a customer; the account is made when the e-mail address is confirmed',
    },
    async (_req, res, { body }) => {
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
            {
              name: existing.name,
              signInUrl: `${config.publicUrl}/sign-in`,
              resetUrl: `${config.publicUrl}/forgot-password`,
            },
            now,
          );
          return;
        }
        const { hash, expiresAt } = await mailVerifyLink(trx, body, now);
        await upsertPendingSignup(trx, {
          email: body.email,
          name: body.name,
          password_hash: passwordHash,
          token_hash: hash,
          expires_at: expiresAt,
          created_at: now.toISOString(),
        });
      });
      res
        .status(202)
        .json(
          checkYourMail(
            `We sent a link to ${body.email}. Follow it to confirm the address and finish signing up.`,
          ),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup/resend',
      roles: 'public',
      body: emailOnlyRequestSchema,
      before: [mailLimiter(config, 'resend')],
      summary: 'Send the verification link of a pending sign-up again',
    },
    async (req, res, { body }) => {
      // looked up and mailed after answering, so the answer takes as long whether a sign-up waits or not
      afterResponse(req, res, async () => {
        const pending = await findPendingSignupByEmail(db, body.email);
        if (!pending) return;
        await db.transaction().execute(async (trx) => {
          const { hash, expiresAt } = await mailVerifyLink(trx, pending, clock.now());
          await renewPendingSignupToken(trx, pending.id, hash, expiresAt);
        });
      });
      res
        .status(202)
        .json(
          checkYourMail(
            `If a sign-up for ${body.email} is waiting, a new link is on its way; the old one no longer works.`,
          ),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup/verify',
      roles: 'public',
      body: verifyEmailRequestSchema,
      summary: 'Confirm the e-mail address of a sign-up; makes the customer account',
    },
    async (_req, res, { body }) => {
      const pending = openLink(await findPendingSignupByToken(db, hashLinkToken(body.token)), clock.now(), {
        invalid:
          'This link is not valid, or was already used. If you have confirmed your address, sign in; otherwise sign up again.',
        expired: 'This link has expired. Ask for a new one or sign up again.',
      });
      const user = await db
        .transaction()
        .execute(async (trx) => {
          const row = await insertUser(trx, {
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
            target: `user:${row.id}`,
            details: { email: row.email, role: row.role, via: 'sign-up' },
          });
          return row;
        })
        .catch((err: unknown) => {
          if (isUniqueViolation(err)) {
            throw new AppError(
              'email-taken',
              409,
              `An account with the e-mail ${pending.email} already exists. Sign in.`,
            );
          }
          throw err;
        });
      res.json({ email: user.email });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/password-reset',
      roles: 'public',
      body: emailOnlyRequestSchema,
      before: [mailLimiter(config, 'password reset')],
      summary: 'Mail a single-use link to choose a new password',
    },
    async (req, res, { body }) => {
      // looked up and mailed after answering, so the answer takes as long whether the account exists or not
      afterResponse(req, res, async () => {
        const user = await findUserByEmail(db, body.email);
        if (!user || user.disabled) return;
        await db.transaction().execute((trx) => mailPasswordLink(trx, user, 'reset', clock.now()));
      });
      res
        .status(202)
        .json(
          checkYourMail(`If ${body.email} has an account, a link to choose a new password is on its way.`),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/password-reset/confirm',
      roles: 'public',
      body: passwordResetConfirmSchema,
      summary: 'Set a new password with the link’s token; every session of the account ends',
    },
    async (_req, res, { body }) => {
      const found = await findPasswordToken(db, hashLinkToken(body.token));
      const now = clock.now().toISOString();
      const token = openLink(found?.used_at === null ? found : undefined, clock.now(), {
        invalid: 'This link is not valid or was already used. Ask for a new one from the sign-in page.',
        expired: 'This link has expired. Ask for a new one from the sign-in page.',
      });
      const user = await findUserById(db, token.user_id);
      if (!user || user.disabled) {
        throw new AppError('link-invalid', 400, 'This link is not valid. Ask the lab for help.');
      }
      const passwordHash = await hashPassword(body.newPassword);
      await db.transaction().execute(async (trx) => {
        // a token used concurrently loses here: only one update finds it open
        const claimed = await trx
          .updateTable('password_tokens')
          .set({ used_at: now })
          .where('id', '=', token.id)
          .where('used_at', 'is', null)
          .executeTakeFirst();
        if (Number(claimed.numUpdatedRows) !== 1) {
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
          details: { via: token.purpose === 'welcome' ? 'welcome-link' : 'reset-link' },
        });
      });
      res.json({ email: user.email });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/customers',
      roles: staffRoles,
      summary: 'Every customer account, by name, for staff at the counter',
    },
    async (_req, res) => {
      const rows = await db
        .selectFrom('users')
        .selectAll()
        .where('role', '=', 'customer')
        .orderBy('name')
        .orderBy('email')
        .execute();
      res.json({ customers: rows.map(toUserRecord) });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/customers',
      roles: staffRoles,
      body: counterCustomerRequestSchema,
      summary: 'Open a customer account at the counter; the customer chooses a password from the mailed link',
    },
    async (_req, res, { body, user: actor }) => {
      if (await findUserByEmail(db, body.email)) {
        throw new AppError('email-taken', 409, `An account with the e-mail ${body.email} already exists.`);
      }
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
          await mailPasswordLink(trx, created, 'welcome', now);
          await recordAudit(trx, {
            at: now,
            actor: actor!,
            action: 'user-created',
            target: `user:${created.id}`,
            details: { email: created.email, role: created.role, via: 'counter' },
          });
          return created;
        })
        .catch((err: unknown) => {
          if (isUniqueViolation(err)) {
            throw new AppError(
              'email-taken',
              409,
              `An account with the e-mail ${body.email} already exists.`,
            );
          }
          throw err;
        });
      res.status(201).json({ user: toUserRecord(row) });
    },
  );
};
