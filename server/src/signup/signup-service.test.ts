import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { createSignupService, type SignupService } from './signup-service';

let t: TestApp;
let signup: SignupService;
beforeAll(async () => {
  t = await createTestApp({ PUBLIC_URL: 'http://lab.test:4300' });
  signup = createSignupService({ db: t.db, clock: t.clock, config: t.config });
});
afterAll(() => t.close());

const mailTo = (address: string) =>
  t.db.selectFrom('outbox').selectAll().where('to_address', '=', address).orderBy('id', 'desc').execute();
const tokenIn = (text: string, path: string) =>
  new RegExp(`http://lab\\.test:4300${path}\\?token=([A-Za-z0-9_-]+)`).exec(text)![1]!;

describe('the sign-up service', () => {
  it('makes the account only from the mailed link, and only once', async () => {
    await signup.signUp({ email: 'ivo@example.test', name: 'Ivo Marsh', password: 'a-long-new-password' });
    expect(
      await t.db.selectFrom('users').where('email', '=', 'ivo@example.test').selectAll().execute(),
    ).toEqual([]);
    const token = tokenIn((await mailTo('ivo@example.test'))[0]!.text_body, '/verify-email');
    const user = await signup.verify(token);
    expect(user).toMatchObject({ email: 'ivo@example.test', role: 'customer', disabled: false });
    await expect(signup.verify(token)).rejects.toMatchObject({ status: 400, code: 'link-invalid' });
  });

  it('mails a reminder instead of a link when the address already has an account', async () => {
    await addUser(t.db, 'customer', 'known@example.test');
    await signup.signUp({ email: 'known@example.test', name: 'Someone', password: 'a-long-new-password' });
    expect((await mailTo('known@example.test')).map((m) => m.kind)).toEqual(['already-registered']);
  });

  it('mails no reset link to a disabled account', async () => {
    await addUser(t.db, 'customer', 'off@example.test', true);
    await signup.mailResetLinkIfKnown('off@example.test');
    await signup.mailResetLinkIfKnown('nobody@example.test');
    expect(await mailTo('off@example.test')).toEqual([]);
  });

  it('lets a reset link set one password when two requests use it at once', async () => {
    await addUser(t.db, 'customer', 'twice@example.test');
    await signup.mailResetLinkIfKnown('twice@example.test');
    const token = tokenIn((await mailTo('twice@example.test'))[0]!.text_body, '/reset-password');
    const results = await Promise.allSettled([
      signup.confirmPasswordReset(token, 'first-new-password'),
      signup.confirmPasswordReset(token, 'second-new-password'),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    const audits = await t.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'password-changed')
      .execute();
    expect(audits).toHaveLength(1);
  });

  it('opens a counter account with a welcome link and refuses an address that has one', async () => {
    const operator = {
      id: await addUser(t.db, 'operator'),
      email: 'operator@lab.test',
      name: 'Op',
      role: 'operator' as const,
    };
    const user = await signup.openCounterAccount(operator, {
      email: 'walk-in@example.test',
      name: 'Tamsin Vell',
    });
    expect(user.role).toBe('customer');
    expect((await mailTo('walk-in@example.test')).map((m) => m.kind)).toEqual(['account-created']);
    await expect(
      signup.openCounterAccount(operator, { email: 'walk-in@example.test', name: 'Again' }),
    ).rejects.toMatchObject({ status: 409, code: 'email-taken' });
    expect((await signup.customers()).map((c) => c.email)).toContain('walk-in@example.test');
  });
});
