import {
  counterCustomerRequestSchema,
  emailOnlyRequestSchema,
  passwordResetConfirmSchema,
  signupRequestSchema,
  staffRoles,
  verifyEmailRequestSchema,
  type CheckYourMailResponse,
} from '@clearbase/contracts';
import type { RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Config } from '../config/config';
import { sendProblem } from '../errors/send-problem';
import { afterResponse } from '../http/after-response';
import type { RouteModule } from '../http/route-module';
import { createSignupService } from './signup-service';

const checkYourMail = (detail: string): CheckYourMailResponse => ({ status: 'check-your-mail', detail });

function mailLimiter(config: Config, what: string): RequestHandler {
  const { max, windowMs } = config.signupRateLimit;
  return rateLimit({
    windowMs,
    limit: max,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => {
      const minutes = Math.ceil(windowMs / 60_000);
      sendProblem(res, 429, `Too many ${what} requests from here. Wait ${minutes} minutes and try again.`, {
        code: 'too-many-requests',
      });
    },
  });
}

/**
 * Sign-up, password reset and accounts opened at the counter (the rules are in signup-service.ts). Every request
 * that starts with an address answers the same way whether an account exists or not.
 */
export const signupRoutes: RouteModule = (api, { db, clock, config }) => {
  const signup = createSignupService({ db, clock, config });

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup',
      roles: 'public',
      body: signupRequestSchema,
      before: [mailLimiter(config, 'sign-up')],
      summary: 'Sign up as a customer; the account is made when the e-mail address is confirmed',
    },
    async (_req, res, { body }) => {
      await signup.signUp(body);
      res
        .status(202)
        .json(
          checkYourMail(
            `We sent a link to ${body.email}. Follow it to confirm the address and finish signing up.`,
          ),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup/resend',
      roles: 'public',
      body: emailOnlyRequestSchema,
      before: [mailLimiter(config, 'resend')],
      summary: 'Send the verification link of a pending sign-up again',
    },
    (req, res, { body }) => {
      // looked up and mailed after answering, so the answer takes as long whether a sign-up waits or not
      afterResponse(req, res, () => signup.resendVerifyLink(body.email));
      res
        .status(202)
        .json(
          checkYourMail(
            `If a sign-up for ${body.email} is waiting, a new link is on its way; the old one no longer works.`,
          ),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/signup/verify',
      roles: 'public',
      body: verifyEmailRequestSchema,
      summary: 'Confirm the e-mail address of a sign-up; makes the customer account',
    },
    async (_req, res, { body }) => {
      const user = await signup.verify(body.token);
      res.json({ email: user.email });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/password-reset',
      roles: 'public',
      body: emailOnlyRequestSchema,
      before: [mailLimiter(config, 'password reset')],
      summary: 'Mail a single-use link to choose a new password',
    },
    (req, res, { body }) => {
      // looked up and mailed after answering, so the answer takes as long whether the account exists or not
      afterResponse(req, res, () => signup.mailResetLinkIfKnown(body.email));
      res
        .status(202)
        .json(
          checkYourMail(`If ${body.email} has an account, a link to choose a new password is on its way.`),
        );
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/auth/password-reset/confirm',
      roles: 'public',
      body: passwordResetConfirmSchema,
      summary: 'Set a new password with the link’s token; every session of the account ends',
    },
    async (_req, res, { body }) => {
      const user = await signup.confirmPasswordReset(body.token, body.newPassword);
      res.json({ email: user.email });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/customers',
      roles: staffRoles,
      summary: 'Every customer account, by name, for staff at the counter',
    },
    async (_req, res) => {
      res.json({ customers: await signup.customers() });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/customers',
      roles: staffRoles,
      body: counterCustomerRequestSchema,
      summary: 'Open a customer account at the counter; the customer chooses a password from the mailed link',
    },
    async (_req, res, { body, user }) => {
      res.status(201).json({ user: await signup.openCounterAccount(user!, body) });
    },
  );
};
