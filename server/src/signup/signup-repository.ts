import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { PasswordTokenRow, PendingSignupRow } from './signup-tables';

/** Adds or replaces the pending sign-up of an address (the newest sign-up and its link win). */
export async function upsertPendingSignup(
  db: Kysely<Database>,
  row: {
    email: string;
    name: string;
    password_hash: string;
    token_hash: string;
    expires_at: string;
    created_at: string;
  },
): Promise<void> {
  await db
    .insertInto('pending_signups')
    .values(row)
    .onConflict((oc) =>
      oc.column('email').doUpdateSet({
        name: row.name,
        password_hash: row.password_hash,
        token_hash: row.token_hash,
        expires_at: row.expires_at,
        created_at: row.created_at,
      }),
    )
    .execute();
}

export function findPendingSignupByEmail(
  db: Kysely<Database>,
  email: string,
): Promise<PendingSignupRow | undefined> {
  return db.selectFrom('pending_signups').selectAll().where('email', '=', email).executeTakeFirst();
}

export function findPendingSignupByToken(
  db: Kysely<Database>,
  tokenHash: string,
): Promise<PendingSignupRow | undefined> {
  return db.selectFrom('pending_signups').selectAll().where('token_hash', '=', tokenHash).executeTakeFirst();
}

export async function renewPendingSignupToken(
  db: Kysely<Database>,
  id: number,
  tokenHash: string,
  expiresAt: string,
): Promise<void> {
  await db
    .updateTable('pending_signups')
    .set({ token_hash: tokenHash, expires_at: expiresAt })
    .where('id', '=', id)
    .execute();
}

export async function deletePendingSignup(db: Kysely<Database>, id: number): Promise<void> {
  await db.deleteFrom('pending_signups').where('id', '=', id).execute();
}

export async function insertPasswordToken(
  db: Kysely<Database>,
  row: {
    user_id: number;
    token_hash: string;
    purpose: 'reset' | 'welcome';
    expires_at: string;
    created_at: string;
  },
): Promise<void> {
  await db
    .insertInto('password_tokens')
    .values({ ...row, used_at: null })
    .execute();
}

export function findPasswordToken(
  db: Kysely<Database>,
  tokenHash: string,
): Promise<PasswordTokenRow | undefined> {
  return db.selectFrom('password_tokens').selectAll().where('token_hash', '=', tokenHash).executeTakeFirst();
}

/** Uses up every open token of a user, so one new password closes all the links mailed before it. */
export async function usePasswordTokens(db: Kysely<Database>, userId: number, at: string): Promise<void> {
  await db
    .updateTable('password_tokens')
    .set({ used_at: at })
    .where('user_id', '=', userId)
    .where('used_at', 'is', null)
    .execute();
}

/** Marks one token used if it is still open; false when another request used it first. */
export async function claimPasswordToken(db: Kysely<Database>, id: number, at: string): Promise<boolean> {
  const claimed = await db
    .updateTable('password_tokens')
    .set({ used_at: at })
    .where('id', '=', id)
    .where('used_at', 'is', null)
    .executeTakeFirst();
  return Number(claimed.numUpdatedRows) === 1;
}
