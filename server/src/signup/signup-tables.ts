import type { ColumnType, Generated, Selectable } from 'kysely';

/**
 * Someone who signed up and has not yet followed the link in the verification mail. The account itself is made only
 * when they do, so an address nobody confirmed can never sign in.
 */
export interface PendingSignupsTable {
  id: Generated<number>;
  email: string;
  name: string;
  password_hash: string;
  /** SHA-256 (hex) of the token in the link; the token itself is never stored. */
  token_hash: string;
  expires_at: string;
  created_at: ColumnType<string, string, string>;
}

/** A single-use link to choose a password: a reset the user asked for, or the first one of an account staff made. */
export interface PasswordTokensTable {
  id: Generated<number>;
  user_id: number;
  /** SHA-256 (hex) of the token in the link. */
  token_hash: string;
  purpose: 'reset' | 'welcome';
  expires_at: string;
  created_at: ColumnType<string, string, never>;
  used_at: string | null;
}

export type PendingSignupRow = Selectable<PendingSignupsTable>;
export type PasswordTokenRow = Selectable<PasswordTokensTable>;
