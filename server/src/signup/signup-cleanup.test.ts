import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { until } from '../test-support/until';
import { signupCleanupService } from './signup-cleanup';
import { insertPasswordToken, upsertPendingSignup } from './signup-repository';

let t: TestApp;
let userId: number;
const day = 24 * 3600_000;
const now = new Date('2026-06-10T12:00:00Z');
const ago = (ms: number) => new Date(now.getTime() - ms).toISOString();
const later = (ms: number) => new Date(now.getTime() + ms).toISOString();

beforeAll(async () => {
  t = await createTestApp();
  userId = await addUser(t.db, 'customer', 'keeper@example.test');
});
afterAll(() => t.close());

async function pendingEmails() {
  const rows = await t.db.selectFrom('pending_signups').select('email').orderBy('email').execute();
  return rows.map((r) => r.email);
}

async function tokenHashes() {
  const rows = await t.db.selectFrom('password_tokens').select('token_hash').orderBy('token_hash').execute();
  return rows.map((r) => r.token_hash);
}

async function addSignup(email: string, createdAt: string) {
  await upsertPendingSignup(t.db, {
    email,
    name: 'Someone',
    password_hash: 'x',
    token_hash: `hash-${email}`,
    expires_at: new Date(new Date(createdAt).getTime() + day).toISOString(),
    created_at: createdAt,
  });
}

async function addToken(hash: string, expiresAt: string, usedAt: string | null) {
  await insertPasswordToken(t.db, {
    user_id: userId,
    token_hash: hash,
    purpose: 'reset',
    expires_at: expiresAt,
    created_at: ago(10 * day),
  });
  if (usedAt) {
    await t.db
      .updateTable('password_tokens')
      .set({ used_at: usedAt })
      .where('token_hash', '=', hash)
      .execute();
  }
}

describe('the sign-up clean-up', () => {
  it('removes sign-ups unconfirmed for a week and password links used or expired over a day ago, keeping the rest', async () => {
    await addSignup('abandoned@example.test', ago(7 * day + 60_000));
    await addSignup('this-week@example.test', ago(6 * day));
    await addSignup('today@example.test', ago(3600_000));
    await addToken('a-used-two-days-ago', later(day), ago(2 * day));
    await addToken('b-expired-two-days-ago', ago(2 * day), null);
    await addToken('c-used-an-hour-ago', later(day), ago(3600_000));
    await addToken('d-expired-an-hour-ago', ago(3600_000), null);
    await addToken('e-open', later(2 * day), null);

    t.clock.set(now);
    const cleanup = signupCleanupService({
      db: t.db,
      clock: t.clock,
      logger: pino({ level: 'silent' }),
      intervalMs: 3600_000,
    });
    expect(await cleanup.runOnce()).toEqual({ pendingSignups: 1, passwordTokens: 2 });

    expect(await pendingEmails()).toEqual(['this-week@example.test', 'today@example.test']);
    expect(await tokenHashes()).toEqual(['c-used-an-hour-ago', 'd-expired-an-hour-ago', 'e-open']);

    // a day and a half later the links spent an hour ago have gone too; the open link stays until it is spent
    t.clock.set(new Date(now.getTime() + 1.5 * day));
    expect(await cleanup.runOnce()).toEqual({ pendingSignups: 1, passwordTokens: 2 });
    expect(await pendingEmails()).toEqual(['today@example.test']);
    expect(await tokenHashes()).toEqual(['e-open']);
  });

  it('runs on the configured interval once started', async () => {
    await addSignup('old-again@example.test', ago(30 * day));
    t.clock.set(now);
    const cleanup = signupCleanupService({
      db: t.db,
      clock: t.clock,
      logger: pino({ level: 'silent' }),
      intervalMs: 20,
    });
    cleanup.start();
    try {
      // a sweep has run once the old sign-up is gone; on a busy machine the first tick may come late
      await until(async () => !(await pendingEmails()).includes('old-again@example.test'));
    } finally {
      await cleanup.stop();
    }
    expect(await pendingEmails()).not.toContain('old-again@example.test');
  });
});
