import session from 'express-session';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { Clock } from '../clock';

type Callback = (err?: unknown) => void;

/** The user id passport keeps in a session, if any. */
function userIdOf(data: session.SessionData): number | null {
  const user = (data as { passport?: { user?: unknown } }).passport?.user;
  return typeof user === 'number' ? user : null;
}

/**
 * express-session store over the sessions table. It records the signed-in user's id beside the data so that a user's
 * sessions can be dropped together (password change, account disabled).
 */
export class KyselySessionStore extends session.Store {
  constructor(
    private readonly db: Kysely<Database>,
    private readonly clock: Clock,
    private readonly defaultMaxAgeMs: number,
  ) {
    super();
  }

  private expiryOf(data: session.SessionData): string {
    const expires = data.cookie?.expires;
    const at = expires ? new Date(expires) : new Date(this.clock.now().getTime() + this.defaultMaxAgeMs);
    return at.toISOString();
  }

  override get(sid: string, callback: (err: unknown, session?: session.SessionData | null) => void): void {
    this.db
      .selectFrom('sessions')
      .select(['data', 'expires_at'])
      .where('sid', '=', sid)
      .executeTakeFirst()
      .then((row) => {
        if (!row || row.expires_at <= this.clock.now().toISOString()) return callback(null, null);
        callback(null, JSON.parse(row.data) as session.SessionData);
      }, callback);
  }

  override set(sid: string, data: session.SessionData, callback?: Callback): void {
    const row = { sid, user_id: userIdOf(data), data: JSON.stringify(data), expires_at: this.expiryOf(data) };
    this.db
      .insertInto('sessions')
      .values(row)
      .onConflict((oc) =>
        oc.column('sid').doUpdateSet({ user_id: row.user_id, data: row.data, expires_at: row.expires_at }),
      )
      .execute()
      .then(
        () => callback?.(),
        (err) => callback?.(err),
      );
  }

  override touch(sid: string, data: session.SessionData, callback?: Callback): void {
    this.db
      .updateTable('sessions')
      .set({ expires_at: this.expiryOf(data) })
      .where('sid', '=', sid)
      .execute()
      .then(
        () => callback?.(),
        (err) => callback?.(err),
      );
  }

  override destroy(sid: string, callback?: Callback): void {
    this.db
      .deleteFrom('sessions')
      .where('sid', '=', sid)
      .execute()
      .then(
        () => callback?.(),
        (err) => callback?.(err),
      );
  }

  /** Removes expired sessions; main.ts calls it now and then. */
  async prune(): Promise<number> {
    const result = await this.db
      .deleteFrom('sessions')
      .where('expires_at', '<=', this.clock.now().toISOString())
      .executeTakeFirst();
    return Number(result.numDeletedRows);
  }
}

/** Drops every session of a user, except optionally the one making the request. */
export async function dropUserSessions(
  db: Kysely<Database>,
  userId: number,
  exceptSid?: string,
): Promise<void> {
  let query = db.deleteFrom('sessions').where('user_id', '=', userId);
  if (exceptSid) query = query.where('sid', '!=', exceptSid);
  await query.execute();
}
