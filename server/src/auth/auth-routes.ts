import { changePasswordRequestSchema, loginRequestSchema, type User } from '@clearbase/contracts';
import type { Request, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { AppPassport } from './create-passport';
import { recordAudit } from '../audit/audit-log';
import { AppError } from '../errors/app-error';
import { sendProblem } from '../errors/send-problem';
import type { RouteModule } from '../http/route-module';
import { updateUser } from '../users/user-repository';
import { changePassword } from './change-password';
import { sessionCookieName } from './session-cookie-name';

const wrongCredentials = 'The e-mail or password is not right.';

function authenticate(passport: AppPassport, req: Request, res: Response): Promise<User | false> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', { session: false }, (err: unknown, user: User | false) =>
      err ? reject(err) : resolve(user),
    )(req, res, reject);
  });
}

function logIn(req: Request, user: User): Promise<void> {
  // passport 0.7 regenerates the session id here, so a session fixed before sign-in is worthless afterwards
  return new Promise((resolve, reject) => req.logIn(user, (err) => (err ? reject(err) : resolve())));
}

function logOut(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.logOut((err) => (err ? reject(err) : resolve())));
}

/** Sign-in, sign-out, the current user and password change. */
export function authRoutes(passport: AppPassport): RouteModule {
  return (api, { db, clock, config }) => {
    const { max, addressMax, windowMs } = config.loginRateLimit;
    const tooMany = (_req: Request, res: Response) => {
      const minutes = Math.ceil(windowMs / 60_000);
      sendProblem(res, 429, `Too many failed sign-in attempts. Wait ${minutes} minutes and try again.`, {
        code: 'too-many-sign-ins',
      });
    };
    // only failed sign-ins count: per client address and e-mail (guessing one account's password), and per address
    // over all e-mails (one password tried on many accounts)
    const limiter = (limit: number, keyOf: (req: Request) => string) =>
      rateLimit({
        windowMs,
        limit,
        skipSuccessfulRequests: true,
        standardHeaders: 'draft-8',
        legacyHeaders: false,
        keyGenerator: keyOf,
        handler: tooMany,
      });
    const address = (req: Request) => ipKeyGenerator(req.ip ?? '');
    const loginLimiters = [
      limiter(addressMax, address),
      limiter(max, (req) => `${address(req)}|${String(req.body?.email ?? '').toLowerCase()}`),
    ];

    api.define(
      {
        method: 'post',
        path: '/api/auth/login',
        roles: 'public',
        body: loginRequestSchema,
        before: loginLimiters,
        summary: 'Sign in with e-mail and password',
      },
      async (req, res, { body }) => {
        const user = await authenticate(passport, req, res);
        if (!user) {
          await recordAudit(db, {
            at: clock.now(),
            actor: null,
            action: 'sign-in-failed',
            target: null,
            details: { email: body.email },
          });
          throw new AppError('wrong-credentials', 401, wrongCredentials);
        }
        await logIn(req, user);
        await updateUser(db, user.id, { last_sign_in_at: clock.now().toISOString() });
        await recordAudit(db, { at: clock.now(), actor: user, action: 'sign-in', target: `user:${user.id}` });
        res.json({ user });
      },
    );

    api.define(
      {
        method: 'post',
        path: '/api/auth/logout',
        roles: 'public',
        summary: 'Sign out (harmless when signed out)',
      },
      async (req, res) => {
        const user = req.user;
        if (user) {
          await logOut(req);
          await recordAudit(db, {
            at: clock.now(),
            actor: user,
            action: 'sign-out',
            target: `user:${user.id}`,
          });
        }
        await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
        res.clearCookie(sessionCookieName, { path: '/' });
        res.status(204).end();
      },
    );

    api.define(
      { method: 'get', path: '/api/auth/me', roles: 'signed-in', summary: 'The signed-in user' },
      (_req, res, { user }) => {
        res.json(user);
      },
    );

    api.define(
      {
        method: 'post',
        path: '/api/auth/password',
        roles: 'signed-in',
        body: changePasswordRequestSchema,
        summary: 'Change my password; my other sessions end',
      },
      async (req, res, { body, user }) => {
        await changePassword({ db, clock }, user!, body, req.sessionID);
        res.status(204).end();
      },
    );
  };
}
