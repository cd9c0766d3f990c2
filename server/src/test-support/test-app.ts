import type { Role } from '@clearbase/contracts';
import type { Express } from 'express';
import type { Kysely } from 'kysely';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import request from 'supertest';
import { createApp, type AppDeps } from '../app';
import { hashPassword } from '../auth/password-hash';
import { loadConfig, type Config } from '../config/config';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { migrateToLatest } from '../db/migrate';
import { openDatabase } from '../db/open-database';
import { insertUser } from '../users/user-repository';
import { blockOutboundNetwork } from './block-outbound-network';

blockOutboundNetwork();

export interface TestApp {
  app: Express;
  db: Kysely<Database>;
  config: Config;
  clock: Clock & { set(at: Date): void };
  close(): Promise<void>;
}

/** A fresh app over a fresh migrated database in a temporary folder. */
export async function createTestApp(
  env: Record<string, string> = {},
  extra: Partial<AppDeps> = {},
): Promise<TestApp> {
  const dataDir = mkdtempSync(join(tmpdir(), 'clearbase-test-'));
  const config = loadConfig({
    NODE_ENV: 'test',
    DATA_DIR: dataDir,
    SESSION_SECRET: 'test-secret-'.padEnd(40, 'x'),
    ...env,
  });
  const db = openDatabase(join(dataDir, 'test.sqlite'));
  await migrateToLatest(db);
  let now = new Date('2026-03-02T09:00:00Z');
  const clock = { now: () => new Date(now), set: (at: Date) => (now = at) };
  const app = createApp({
    db,
    config,
    clock,
    logger: pino({ level: 'silent' }),
    webRoot: join(dataDir, 'no-web'),
    ...extra,
  });
  return {
    app,
    db,
    config,
    clock,
    async close() {
      await db.destroy();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export const testPassword = 'correct-horse-battery';

/** Adds a user with `testPassword`; returns its id. */
export async function addUser(
  db: Kysely<Database>,
  role: Role,
  email = `${role}@lab.test`,
  disabled = false,
): Promise<number> {
  const row = await insertUser(db, {
    email,
    name: `Test ${role}`,
    role,
    password_hash: await hashPassword(testPassword),
    disabled: disabled ? 1 : 0,
    created_at: '2026-03-01T00:00:00.000Z',
    last_sign_in_at: null,
    password_changed_at: null,
  });
  return row.id;
}

/** A cookie-keeping client that has fetched its CSRF token and sends it on every unsafe request. */
export interface Client {
  agent: ReturnType<typeof request.agent>;
  token: string;
  get(path: string): request.Test;
  post(path: string, body?: object): request.Test;
  patch(path: string, body?: object): request.Test;
  send(method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, body?: object): request.Test;
}

function csrfFrom(setCookie: string[] | string | undefined): string | undefined {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  const line = list.find((c) => c.startsWith('XSRF-TOKEN='));
  return line ? decodeURIComponent(line.slice('XSRF-TOKEN='.length).split(';')[0]!) : undefined;
}

export async function client(app: Express): Promise<Client> {
  const agent = request.agent(app);
  const res = await agent.get('/api/health');
  const token = csrfFrom(res.headers['set-cookie']);
  if (!token) throw new Error('no XSRF-TOKEN cookie on GET /api/health');
  const send = (method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, body?: object) => {
    const t = agent[method](path).set('X-XSRF-TOKEN', token);
    return body === undefined ? t : t.send(body);
  };
  return {
    agent,
    token,
    send,
    get: (path) => agent.get(path),
    post: (path, body) => send('post', path, body),
    patch: (path, body) => send('patch', path, body),
  };
}

/** A client signed in as the given e-mail with `testPassword`. */
export async function signedIn(app: Express, email: string): Promise<Client> {
  const c = await client(app);
  const res = await c.post('/api/auth/login', { email, password: testPassword });
  if (res.status !== 200) throw new Error(`sign-in as ${email} answered ${res.status}: ${res.text}`);
  return c;
}
