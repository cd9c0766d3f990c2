import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../test-support/test-app';

let t: TestApp;
const web = mkdtempSync(join(tmpdir(), 'clearbase-web-'));
beforeAll(async () => {
  mkdirSync(web, { recursive: true });
  writeFileSync(join(web, 'index.html'), '<!doctype html><title>Clearbase</title>');
  writeFileSync(join(web, 'main-AB12CD34.js'), 'console.log(1)');
  t = await createTestApp({}, { webRoot: web });
});
afterAll(async () => {
  await t.close();
  rmSync(web, { recursive: true, force: true });
});

describe('serving the web app', () => {
  it('answers client-side routes with index.html, revalidated every time', async () => {
    const res = await request(t.app).get('/orders/12').set('Accept', 'text/html');
    expect(res.status).toBe(200);
    expect(res.text).toContain('<title>Clearbase</title>');
    expect(res.headers['cache-control']).toBe('no-cache');
  });

  it('caches hashed bundles for a year', async () => {
    const res = await request(t.app).get('/main-AB12CD34.js');
    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it('keeps unknown API routes as 404 problems rather than the page', async () => {
    const res = await request(t.app).get('/api/nope');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
  });
});
