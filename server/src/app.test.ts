import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { client, createTestApp, type TestApp } from './test-support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ JSON_BODY_LIMIT_BYTES: '2048' });
});
afterAll(() => t.close());

const problemType = /^application\/problem\+json/;

describe('the API edge', () => {
  it('answers /api/health publicly and sets a script-readable XSRF-TOKEN cookie', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true });
    const cookie = ([] as string[])
      .concat(res.headers['set-cookie'] ?? [])
      .find((c) => c.startsWith('XSRF-TOKEN='));
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/HttpOnly/i);
  });

  it('refuses a POST without the X-XSRF-TOKEN header with a 403 problem', async () => {
    const c = await client(t.app);
    const res = await c.agent.post('/api/auth/login').send({ email: 'a@lab.test', password: 'x' });
    expect(res.status).toBe(403);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.body.detail).toMatch(/X-XSRF-TOKEN/);
  });

  it('refuses a POST whose header does not match the cookie', async () => {
    const c = await client(t.app);
    const res = await c.agent
      .post('/api/auth/login')
      .set('X-XSRF-TOKEN', c.token + 'x')
      .send({});
    expect(res.status).toBe(403);
  });

  it('refuses a forged token that matches its own cookie but lacks the server signature', async () => {
    const forged = 'abc.def';
    const res = await request(t.app)
      .post('/api/auth/login')
      .set('Cookie', `XSRF-TOKEN=${forged}`)
      .set('X-XSRF-TOKEN', forged)
      .send({ email: 'a@lab.test', password: 'x' });
    expect(res.status).toBe(403);
  });

  it('refuses every unsafe method without a token whatever the letter case of the path', async () => {
    const c = await client(t.app);
    const failures: string[] = [];
    for (const method of ['post', 'put', 'patch', 'delete'] as const) {
      for (const path of ['/API/orders', '/Api/orders', '/api/Orders', '/API/rolls/5/frames', '/other']) {
        const res = await c.agent[method](path).send({});
        if (res.status !== 403 || res.body.type !== 'about:blank' || !/X-XSRF-TOKEN/.test(res.body.detail)) {
          failures.push(`${method.toUpperCase()} ${path}: ${res.status}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });

  it('routes paths case-sensitively: an upper-case API path reaches no route', async () => {
    const c = await client(t.app);
    const login = await c.post('/API/auth/login', { email: 'a@lab.test', password: 'x' });
    expect(login.status).toBe(404);
    expect(login.headers['content-type']).toMatch(problemType);
    expect((await request(t.app).get('/API/health')).status).not.toBe(200);
  });

  it('does not exempt the payment webhook when its path is spelt in another case', async () => {
    const res = await request(t.app).post('/API/payments/webhook').send({});
    expect(res.status).toBe(403);
  });

  it('answers malformed JSON with a 400 problem', async () => {
    const c = await client(t.app);
    const res = await c.agent
      .post('/api/auth/login')
      .set('X-XSRF-TOKEN', c.token)
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.body).toMatchObject({ status: 400, detail: 'The request body is not valid JSON.' });
  });

  it('answers a schema violation with a 400 problem listing each field', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/login', { email: 'not-an-address', password: '' });
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.body.errors).toEqual([
      { path: 'body.email', message: 'Enter a valid e-mail address' },
      { path: 'body.password', message: 'Enter your password' },
    ]);
  });

  it('answers a body over the limit with a 413 problem', async () => {
    const c = await client(t.app);
    const res = await c.post('/api/auth/login', { email: 'a@lab.test', password: 'x'.repeat(4000) });
    expect(res.status).toBe(413);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.body.detail).toMatch(/larger than the limit of 2048 bytes/);
  });

  it('answers an unknown API route with a 404 problem', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.body).toMatchObject({
      type: 'about:blank',
      title: 'Not Found',
      status: 404,
      instance: '/api/no-such-thing',
    });
  });

  it('sends a content security policy that allows only this origin', async () => {
    const res = await request(t.app).get('/api/health');
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    // the hash of exactly this.media='all', computed with node:crypto SHA-256 as CSP Level 3 defines hash-source
    const hash = (await import('node:crypto'))
      .createHash('sha256')
      .update("this.media='all'")
      .digest('base64');
    expect(csp).toContain(`'sha256-${hash}'`);
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/https?:\/\//);
  });

  it('never sends internals when a handler fails', async () => {
    const { createTestApp: make } = await import('./test-support/test-app');
    const broken = await make(
      {},
      {
        routeModules: [
          (api) =>
            api.define({ method: 'get', path: '/api/broken', roles: 'public' }, () => {
              throw new Error('secret table name users_internal');
            }),
        ],
      },
    );
    const res = await request(broken.app).get('/api/broken');
    expect(res.status).toBe(500);
    expect(res.headers['content-type']).toMatch(problemType);
    expect(res.text).not.toContain('users_internal');
    await broken.close();
  });
});
