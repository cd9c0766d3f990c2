import type { Role } from '@clearbase/contracts';
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

/** Times are ISO-8601 UTC text; booleans are 0/1 integers (SQLite has no boolean type). */
export interface UsersTable {
  id: Generated<number>;
  email: string;
  name: string;
  role: Role;
  password_hash: string;
  disabled: ColumnType<number, number | undefined, number>;
  created_at: ColumnType<string, string, never>;
  last_sign_in_at: string | null;
  password_changed_at: string | null;
}

export interface SessionsTable {
  sid: string;
  user_id: number | null;
  data: string;
  expires_at: string;
}

export interface AuditLogTable {
  id: Generated<number>;
  at: ColumnType<string, string, never>;
  actor_id: number | null;
  actor_email: string | null;
  action: string;
  target: string | null;
  /** JSON object text */
  details: string | null;
}

/** Lab-wide settings as key/value pairs (value is JSON text). */
export interface SettingsTable {
  key: string;
  value: string;
}

/** The one database schema of Clearbase. */
export interface Database {
  users: UsersTable;
  sessions: SessionsTable;
  audit_log: AuditLogTable;
  settings: SettingsTable;
}

export type UserRow = Selectable<UsersTable>;
export type NewUserRow = Insertable<UsersTable>;
export type UserRowUpdate = Updateable<UsersTable>;
