import type { Kysely } from 'kysely';
import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Database } from '../db/database';
import { findUserByEmail, findUserById, toUser } from '../users/user-repository';
import { burnPasswordCheck, verifyPassword } from './password-hash';

/**
 * A passport instance of this app's own (not the module-wide singleton), with the e-mail/password strategy. Unknown
 * e-mail, wrong password and disabled account all fail the same way, after the same scrypt work.
 */
/** This app's passport instance. */
export type AppPassport = InstanceType<typeof Passport>;

export function createPassport(db: Kysely<Database>): AppPassport {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const row = await findUserByEmail(db, email);
        const ok = row
          ? await verifyPassword(password, row.password_hash)
          : await burnPasswordCheck(password);
        if (!row || !ok || row.disabled) return done(null, false, { message: 'wrong-credentials' });
        return done(null, toUser(row));
      })().catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'number') return done(null, false);
    findUserById(db, id).then(
      // a disabled or deleted account is signed out on its next request
      (row) => done(null, row && !row.disabled ? toUser(row) : false),
      done,
    );
  });
  return passport;
}
