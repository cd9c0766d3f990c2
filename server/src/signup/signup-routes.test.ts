import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { settleAfterResponse } from '../http/after-response';
import {
  addUser,
  client,
  createTestApp,
  signedIn,
  testPassword,
  type TestApp,
} from '../test-support/test-app';

let t: TestApp;

beforeAll(async () => {
  t = await createTestApp({ SIGNUP_RATE_LIMIT_MAX: '1000', PUBLIC_URL: 'http://lab.test:4300' });
  await addUser(t.db, 'operator');
  await addUser(t.db, 'customer', 'known@example.test');
});
afterAll(() => t.close());

/** The mail queued for an address, newest first, once the work done after answering has ended. */
async function mailTo(address: string) {
  await settleAfterResponse();
  return t.db
    .selectFrom('outbox')
    .selectAll()
    .where('to_address', '=', address)
    .orderBy('id', 'desc')
    .execute();
}

function tokenIn(text: string, path: string): string {
  const match = new RegExp(`http://lab\\.test:4300${path}\\?token=([A-Za-z0-9_-]+)`).exec(text);
  if (!match) throw new Error(`no ${path} link in:\n${text}`);
  return match[1]!;
}

async function signUp(email: string, password = 'a-long-new-password') {
  const c = await client(t.app);
  return c.post('/api/auth/signup', { email, name: 'Wren Hollis', password });
}

describe('sign-up with a confirmed e-mail address', () => {
  it('makes no account until the link in the mail is followed, then the customer signs in', async () => {
    const res = await signUp('Wren@Example.test');
    expect(res.status).toBe(202);
    expect(res.body.status).toBe('check-your-mail');

    const c = await client(t.app);
    const before = await c.post('/api/auth/login', {
      email: 'wren@example.test',
      password: 'a-long-new-password',
    });
    expect(before.status).toBe(401);

    const [mail] = await mailTo('wren@example.test');
    expect(mail).toMatchObject({ kind: 'verify-email', state: 'pending' });
    const token = tokenIn(mail!.text_body, '/verify-email');
    const verified = await c.post('/api/auth/signup/verify', { token });
    expect(verified.status).toBe(200);
    expect(verified.body).toEqual({ email: 'wren@example.test' });

    const after = await c.post('/api/auth/login', {
      email: 'wren@example.test',
      password: 'a-long-new-password',
    });
    expect(after.status).toBe(200);
    expect(after.body.user).toMatchObject({
      email: 'wren@example.test',
      name: 'Wren Hollis',
      role: 'customer',
    });

    const again = await c.post('/api/auth/signup/verify', { token });
    expect(again.status).toBe(400);
    expect(again.headers['content-type']).toMatch(/application\/problem\+json/);
  });

  it('answers a sign-up for a known address exactly as for a new one, and tells the owner by mail', async () => {
    const known = await signUp('known@example.test');
    const fresh = await signUp('new-person@example.test');
    expect(known.status).toBe(fresh.status);
    expect(Object.keys(known.body)).toEqual(Object.keys(fresh.body));
    expect(known.body.detail.replace('known@example.test', 'X')).toBe(
      fresh.body.detail.replace('new-person@example.test', 'X'),
    );
    const [mail] = await mailTo('known@example.test');
    expect(mail!.kind).toBe('already-registered');
    const c = await client(t.app);
    expect(
      (await c.post('/api/auth/login', { email: 'known@example.test', password: testPassword })).status,
    ).toBe(200);
  });

  it('refuses an expired verification link with 410 and makes no account', async () => {
    await signUp('late@example.test');
    const token = tokenIn((await mailTo('late@example.test'))[0]!.text_body, '/verify-email');
    const start = t.clock.now();
    t.clock.set(new Date(start.getTime() + 25 * 3600_000));
    try {
      const c = await client(t.app);
      const res = await c.post('/api/auth/signup/verify', { token });
      expect(res.status).toBe(410);
      expect(res.body.code).toBe('link-expired');
    } finally {
      t.clock.set(start);
    }
    const users = await t.db
      .selectFrom('users')
      .select('id')
      .where('email', '=', 'late@example.test')
      .execute();
    expect(users).toEqual([]);
  });

  it('resends a fresh link and the old one stops working', async () => {
    await signUp('twice@example.test');
    const oldToken = tokenIn((await mailTo('twice@example.test'))[0]!.text_body, '/verify-email');
    const c = await client(t.app);
    expect((await c.post('/api/auth/signup/resend', { email: 'twice@example.test' })).status).toBe(202);
    const mails = await mailTo('twice@example.test');
    expect(mails).toHaveLength(2);
    const newToken = tokenIn(mails[0]!.text_body, '/verify-email');
    expect((await c.post('/api/auth/signup/verify', { token: oldToken })).status).toBe(400);
    expect((await c.post('/api/auth/signup/verify', { token: newToken })).status).toBe(200);
  });

  it('answers a resend for an unknown address the same and sends nothing', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/signup/resend', { email: 'nobody@example.test' });
    expect(res.status).toBe(202);
    expect(await mailTo('nobody@example.test')).toEqual([]);
  });

  it('checks each field and names it', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/signup', { email: 'not-an-address', name: '', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual([
      'body.email',
      'body.name',
      'body.password',
    ]);
  });
});

describe('password reset by e-mail', () => {
  it('sets a new password once with the mailed link; the old password and the link then stop working', async () => {
    await addUser(t.db, 'customer', 'forgetful@example.test');
    const c = await client(t.app);
    expect((await c.post('/api/auth/password-reset', { email: 'forgetful@example.test' })).status).toBe(202);
    const [mail] = await mailTo('forgetful@example.test');
    expect(mail!.kind).toBe('password-reset');
    const token = tokenIn(mail!.text_body, '/reset-password');

    const done = await c.post('/api/auth/password-reset/confirm', {
      token,
      newPassword: 'brand-new-password',
    });
    expect(done.status).toBe(200);
    expect(
      (await c.post('/api/auth/login', { email: 'forgetful@example.test', password: testPassword })).status,
    ).toBe(401);
    expect(
      (await c.post('/api/auth/login', { email: 'forgetful@example.test', password: 'brand-new-password' }))
        .status,
    ).toBe(200);

    const reuse = await c.post('/api/auth/password-reset/confirm', {
      token,
      newPassword: 'another-password-1',
    });
    expect(reuse.status).toBe(400);
    expect(reuse.body.code).toBe('link-invalid');
  });

  it('signs out every session of the account when the password is reset', async () => {
    await addUser(t.db, 'customer', 'signed-in@example.test');
    const session = await signedIn(t.app, 'signed-in@example.test');
    const c = await client(t.app);
    await c.post('/api/auth/password-reset', { email: 'signed-in@example.test' });
    const token = tokenIn((await mailTo('signed-in@example.test'))[0]!.text_body, '/reset-password');
    await c.post('/api/auth/password-reset/confirm', { token, newPassword: 'brand-new-password' });
    expect((await session.get('/api/auth/me')).status).toBe(401);
  });

  it('refuses a reset link after an hour', async () => {
    await addUser(t.db, 'customer', 'slow@example.test');
    const c = await client(t.app);
    await c.post('/api/auth/password-reset', { email: 'slow@example.test' });
    const token = tokenIn((await mailTo('slow@example.test'))[0]!.text_body, '/reset-password');
    const start = t.clock.now();
    t.clock.set(new Date(start.getTime() + 61 * 60_000));
    try {
      const res = await c.post('/api/auth/password-reset/confirm', {
        token,
        newPassword: 'brand-new-password',
      });
      expect(res.status).toBe(410);
    } finally {
      t.clock.set(start);
    }
  });

  it('answers a reset for an unknown address the same and sends nothing', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/password-reset', { email: 'ghost@example.test' });
    expect(res.status).toBe(202);
    expect(res.body.status).toBe('check-your-mail');
    expect(await mailTo('ghost@example.test')).toEqual([]);
  });
});

describe('answers that tell nothing of who has an account', () => {
  /** Keeps the one database connection busy until the returned function is called. */
  async function holdDatabase(): Promise<() => Promise<void>> {
    let release!: () => void;
    let started!: () => void;
    const running = new Promise<void>((resolve) => (started = resolve));
    const held = t.db.transaction().execute(async () => {
      started();
      await new Promise<void>((resolve) => (release = resolve));
    });
    await running;
    return async () => {
      release();
      await held;
    };
  }

  for (const [what, path] of [
    ['a password reset', '/api/auth/password-reset'],
    ['a resend of the sign-up link', '/api/auth/signup/resend'],
  ] as const) {
    it(`answers ${what} without touching the database, for known and unknown addresses alike`, async () => {
      await addUser(t.db, 'customer', `held-${path.length}@example.test`);
      const c = await client(t.app);
      const release = await holdDatabase();
      try {
        // with the database held, an answer can only come if the lookup happens after it
        const answers = await Promise.all(
          [`held-${path.length}@example.test`, 'nobody-held@example.test'].map((email) =>
            c.post(path, { email }).then((res) => res.status),
          ),
        );
        expect(answers).toEqual([202, 202]);
      } finally {
        await release();
      }
    });
  }
});

describe('accounts opened at the counter', () => {
  it('lets staff open a customer account; the customer chooses a password from the mailed link', async () => {
    const operator = await signedIn(t.app, 'operator@lab.test');
    const res = await operator.post('/api/customers', { email: 'walk-in@example.test', name: 'Tamsin Vell' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'walk-in@example.test', role: 'customer', disabled: false });

    const [mail] = await mailTo('walk-in@example.test');
    expect(mail!.kind).toBe('account-created');
    const token = tokenIn(mail!.text_body, '/reset-password');
    const c = await client(t.app);
    expect(
      (await c.post('/api/auth/password-reset/confirm', { token, newPassword: 'my-own-password' })).status,
    ).toBe(200);
    expect(
      (await c.post('/api/auth/login', { email: 'walk-in@example.test', password: 'my-own-password' }))
        .status,
    ).toBe(200);
  });

  it('refuses a second account for the same address', async () => {
    const operator = await signedIn(t.app, 'operator@lab.test');
    const res = await operator.post('/api/customers', { email: 'known@example.test', name: 'Again' });
    expect(res.status).toBe(409);
  });

  it('is for staff only', async () => {
    const customer = await signedIn(t.app, 'known@example.test');
    expect((await customer.post('/api/customers', { email: 'x@example.test', name: 'X' })).status).toBe(403);
    expect((await customer.get('/api/customers')).status).toBe(403);
  });

  it('lists every customer account for staff, by name, and no staff', async () => {
    const operator = await signedIn(t.app, 'operator@lab.test');
    await operator.post('/api/customers', { email: 'aaron@example.test', name: 'Aaron Quill' }).expect(201);
    const res = await operator.get('/api/customers').expect(200);
    const names = res.body.customers.map((c: { name: string }) => c.name);
    expect(names).toContain('Aaron Quill');
    expect(names).toEqual([...names].sort());
    expect(res.body.customers.every((c: { role: string }) => c.role === 'customer')).toBe(true);
    expect(res.body.customers[0]).not.toHaveProperty('passwordHash');
  });
});

describe('limits on mail-sending requests', () => {
  it('answers 429 with a problem document once an address has asked too often', async () => {
    const limited = await createTestApp({ SIGNUP_RATE_LIMIT_MAX: '2' });
    try {
      const c = await client(limited.app);
      const ask = () => c.post('/api/auth/password-reset', { email: 'someone@example.test' });
      expect((await ask()).status).toBe(202);
      expect((await ask()).status).toBe(202);
      const third = await ask();
      expect(third.status).toBe(429);
      expect(third.headers['content-type']).toMatch(/application\/problem\+json/);
    } finally {
      await limited.close();
    }
  });
});
