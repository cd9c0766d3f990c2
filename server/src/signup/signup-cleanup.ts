import type { Kysely } from 'kysely';
import type { Logger } from 'pino';
import type { BackgroundService } from '../background-service';
import type { Clock } from '../clock';
import type { Database } from '../db/database';

// a sign-up nobody confirmed in a week is abandoned; its link died after 24 h anyway (our choice)
export const unverifiedSignupKeepMs = 7 * 24 * 3600_000;
// a used or expired password link is kept a day, so a person asking "why did my link fail" can be answered (our choice)
export const spentPasswordTokenKeepMs = 24 * 3600_000;

/** What one clean-up removed. */
export interface SignupCleanupResult {
  pendingSignups: number;
  passwordTokens: number;
}

/**
 * Removes sign-ups nobody confirmed within a week and password links used or expired more than a day ago. The
 * password hashes of abandoned sign-ups go with them.
 *
 * @example
 * const { pendingSignups, passwordTokens } = await pruneSignups(db, clock.now());
 */
export async function pruneSignups(db: Kysely<Database>, now: Date): Promise<SignupCleanupResult> {
  const signupsBefore = new Date(now.getTime() - unverifiedSignupKeepMs).toISOString();
  const tokensBefore = new Date(now.getTime() - spentPasswordTokenKeepMs).toISOString();
  return db.transaction().execute(async (trx) => {
    const signups = await trx
      .deleteFrom('pending_signups')
      .where('created_at', '<', signupsBefore)
      .executeTakeFirst();
    const tokens = await trx
      .deleteFrom('password_tokens')
      .where((eb) => eb.or([eb('used_at', '<', tokensBefore), eb('expires_at', '<', tokensBefore)]))
      .executeTakeFirst();
    return {
      pendingSignups: Number(signups.numDeletedRows),
      passwordTokens: Number(tokens.numDeletedRows),
    };
  });
}

/**
 * The periodic clean-up of sign-ups and password links, for main.ts: once at start, then every `intervalMs`
 * (SIGNUP_CLEANUP_INTERVAL_MINUTES). A failed pass is logged and the next one tries again.
 *
 * @example
 * services.push(signupCleanupService({ db, clock: systemClock, logger, intervalMs: config.signupCleanupIntervalMs }));
 */
export function signupCleanupService(deps: {
  db: Kysely<Database>;
  clock: Clock;
  logger: Logger;
  intervalMs: number;
}): BackgroundService & { runOnce(): Promise<SignupCleanupResult | null> } {
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<SignupCleanupResult | null> | null = null;
  const runOnce = () =>
    (running ??= pruneSignups(deps.db, deps.clock.now())
      .then((result) => {
        if (result.pendingSignups || result.passwordTokens) {
          deps.logger.info(result, 'removed abandoned sign-ups and spent password links');
        }
        return result;
      })
      .catch((err: unknown) => {
        deps.logger.warn({ err }, 'the sign-up clean-up failed; the next pass tries again');
        return null;
      })
      .finally(() => {
        running = null;
      }));
  return {
    name: 'sign-up clean-up',
    runOnce,
    start() {
      void runOnce();
      timer = setInterval(() => void runOnce(), deps.intervalMs);
      timer.unref();
    },
    async stop() {
      clearInterval(timer);
      await running;
    },
  };
}
