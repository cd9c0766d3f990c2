import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { issueCsrfToken } from '../http/csrf-protection';
import { createTestApp, type TestApp } from '../test-support/test-app';

/** A failed sign-in sent with its own XSRF pair (set by hand: the cookie is Secure on an https address). */
function failedSignIn(t: TestApp, email: string, forwardedFor?: string) {
  const token = issueCsrfToken(t.config.sessionSecret);
  const req = request(t.app)
    .post('/api/auth/login')
    .set('Cookie', `XSRF-TOKEN=${encodeURIComponent(token)}`)
    .set('X-XSRF-TOKEN', token);
  if (forwardedFor) req.set('X-Forwarded-For', forwardedFor);
  return req.send({ email, password: 'not-the-password' }).then((res) => res.status);
}

async function withApp(env: Record<string, string>, run: (t: TestApp) => Promise<void>) {
  const t = await createTestApp(env);
  try {
    await run(t);
  } finally {
    await t.close();
  }
}

describe('sign-in limits', () => {
  it('counts failures per address across accounts, so one password tried on many accounts is stopped', async () => {
    await withApp({ LOGIN_RATE_LIMIT_MAX: '100', LOGIN_RATE_LIMIT_ADDRESS_MAX: '4' }, async (t) => {
      const statuses: number[] = [];
      for (let i = 0; i < 6; i++) statuses.push(await failedSignIn(t, `account-${i}@lab.test`));
      expect(statuses).toEqual([401, 401, 401, 401, 429, 429]);
    });
  });

  it('ignores X-Forwarded-For when no proxy is trusted, even with an https public address', async () => {
    await withApp({ LOGIN_RATE_LIMIT_MAX: '3', PUBLIC_URL: 'https://lab.example.test' }, async (t) => {
      const statuses: number[] = [];
      for (let i = 0; i < 14; i++) statuses.push(await failedSignIn(t, 'victim@lab.test', `203.0.113.${i}`));
      expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
      expect(new Set(statuses.slice(3))).toEqual(new Set([429]));
    });
  });

  it('takes the client address from the trusted proxy when TRUST_PROXY names it', async () => {
    await withApp({ LOGIN_RATE_LIMIT_MAX: '3', TRUST_PROXY: 'loopback' }, async (t) => {
      const first: number[] = [];
      for (let i = 0; i < 4; i++) first.push(await failedSignIn(t, 'victim@lab.test', '203.0.113.1'));
      expect(first).toEqual([401, 401, 401, 429]);
      // another client behind the same proxy is its own address
      expect(await failedSignIn(t, 'victim@lab.test', '203.0.113.2')).toBe(401);
    });
  });
});
