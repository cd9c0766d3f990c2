import session from 'express-session';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { Clock } from '../clock';

type Callback = (err?: unknown) => void;

// a session's expiry is moved forward at most once a minute: a signed-in page makes many requests, and a minute's
// slack on a session of hours changes nothing for the user (our choice)
const touchIntervalMs = 60_000;
// sessions whose last write is remembered; past this the oldest are forgotten and simply written once more (our choice)
const rememberedSessions = 50_000;

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
  /** When each session's row was last written, by this process's clock, in ms. */
  private readonly writtenAt = new Map<string, number>();

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

  private remember(sid: string): void {
    this.writtenAt.delete(sid);
    this.writtenAt.set(sid, this.clock.now().getTime());
    if (this.writtenAt.size > rememberedSessions) this.writtenAt.delete(this.writtenAt.keys().next().value!);
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
        () => {
          this.remember(sid);
          callback?.();
        },
        (err) => callback?.(err),
      );
  }

  /** Moves the expiry forward, at most once a minute per session, so most requests write nothing. */
  override touch(sid: string, data: session.SessionData, callback?: Callback): void {
    const last = this.writtenAt.get(sid);
    if (last !== undefined && this.clock.now().getTime() - last < touchIntervalMs) {
      callback?.();
      return;
    }
    this.db
      .updateTable('sessions')
      .set({ expires_at: this.expiryOf(data) })
      .where('sid', '=', sid)
      .execute()
      .then(
        () => {
          this.remember(sid);
          callback?.();
        },
        (err) => callback?.(err),
      );
  }

  override destroy(sid: string, callback?: Callback): void {
    this.writtenAt.delete(sid);
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
