import type { Role, User, UserRecord } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database, NewUserRow, UserRow, UserRowUpdate } from '../db/database';

export function findUserByEmail(db: Kysely<Database>, email: string): Promise<UserRow | undefined> {
  return db
    .selectFrom('users')
    .selectAll()
    .where('email', '=', email.trim().toLowerCase())
    .executeTakeFirst();
}

export function findUserById(db: Kysely<Database>, id: number): Promise<UserRow | undefined> {
  return db.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
}

export function listUsers(db: Kysely<Database>): Promise<UserRow[]> {
  return db.selectFrom('users').selectAll().orderBy('role').orderBy('email').execute();
}

/** Every customer account, by name then e-mail. */
export function listCustomers(db: Kysely<Database>): Promise<UserRow[]> {
  return db
    .selectFrom('users')
    .selectAll()
    .where('role', '=', 'customer')
    .orderBy('name')
    .orderBy('email')
    .execute();
}

export async function insertUser(db: Kysely<Database>, row: NewUserRow): Promise<UserRow> {
  return db
    .insertInto('users')
    .values({ ...row, email: row.email.trim().toLowerCase() })
    .returningAll()
    .executeTakeFirstOrThrow();
}

export async function updateUser(
  db: Kysely<Database>,
  id: number,
  changes: UserRowUpdate,
): Promise<UserRow | undefined> {
  return db.updateTable('users').set(changes).where('id', '=', id).returningAll().executeTakeFirst();
}

export async function countUsers(db: Kysely<Database>): Promise<number> {
  const { n } = await db
    .selectFrom('users')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(n);
}

export function toUser(row: UserRow): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role as Role };
}

export function toUserRecord(row: UserRow): UserRecord {
  return {
    ...toUser(row),
    disabled: row.disabled === 1,
    createdAt: row.created_at,
    lastSignInAt: row.last_sign_in_at,
  };
}
