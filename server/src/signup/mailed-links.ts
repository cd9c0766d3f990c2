import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Config } from '../config/config';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import { enqueueTemplatedMail } from '../mail/outbox-repository';
import { newLinkToken } from './link-token';
import { insertPasswordToken } from './signup-repository';

// 24 h to confirm an address: common practice for verification links, from memory
export const verifyLinkHours = 24;
// 60 min for a reset link: OWASP Forgot Password cheat sheet suggests a short expiry; common practice, from memory
export const resetLinkMinutes = 60;
// 72 h for a customer whose account staff opened at the counter to choose a password (our choice)
export const welcomeLinkHours = 72;

/**
 * The stored row of a mailed link if it can still be used: 400 `link-invalid` when there is none (unknown, replaced
 * or used), 410 `link-expired` once it has expired. `words` says what the person can do next in each case.
 */
export function openLink<T extends { expires_at: string }>(
  row: T | undefined,
  now: Date,
  words: { invalid: string; expired: string },
): T {
  if (!row) throw new AppError('link-invalid', 400, words.invalid);
  if (row.expires_at <= now.toISOString()) throw new AppError('link-expired', 410, words.expired);
  return row;
}

/** Writes the links the lab mails: to confirm an address, and to choose a password. */
export function createMailedLinks({ clock, config }: { clock: Clock; config: Config }) {
  const link = (path: string, token: string) =>
    `${config.publicUrl}${path}?token=${encodeURIComponent(token)}`;
  const later = (ms: number) => new Date(clock.now().getTime() + ms).toISOString();

  return {
    /**
     * Mails the link that confirms a sign-up's address; the pending sign-up keeps `hash`, the returned token's hash.
     * Sign-up and resend both send it.
     */
    async mailVerifyLink(
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
    },

    /**
     * Stores a single-use link to choose a password and mails it: a reset the user asked for, or the welcome of an
     * account staff opened. Both land on the same page, which sets the password with the token.
     */
    async mailPasswordLink(
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
    },

    /** Where the mails point people who already have an account. */
    signInUrl: `${config.publicUrl}/sign-in`,
    forgotPasswordUrl: `${config.publicUrl}/forgot-password`,
  };
}
