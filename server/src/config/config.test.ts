import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config';

const dir = mkdtempSync(join(tmpdir(), 'clearbase-config-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('configuration from the environment', () => {
  it('uses the documented defaults', () => {
    const config = loadConfig({ DATA_DIR: dir });
    expect(config).toMatchObject({
      port: 4300,
      host: '127.0.0.1',
      nodeEnv: 'development',
      publicUrl: 'http://127.0.0.1:4300',
      secureCookies: false,
      jsonBodyLimitBytes: 1024 * 1024,
      loginRateLimit: { max: 10, addressMax: 30, windowMs: 15 * 60_000 },
      trustProxy: false,
      seedDemo: true,
    });
  });

  it('names the variable with a bad value', () => {
    expect(() => loadConfig({ DATA_DIR: dir, PORT: 'eighty' })).toThrow(ConfigError);
    expect(() => loadConfig({ DATA_DIR: dir, PORT: 'eighty' })).toThrow(/PORT: .*\(received "eighty"\)/);
    expect(() => loadConfig({ DATA_DIR: dir, PUBLIC_URL: 'not a url' })).toThrow(/PUBLIC_URL/);
  });

  it('requires SESSION_SECRET in production', () => {
    expect(() => loadConfig({ DATA_DIR: dir, NODE_ENV: 'production' })).toThrow(
      /SESSION_SECRET: required in production/,
    );
  });

  it('generates a session secret on first start in development and keeps it', () => {
    const first = loadConfig({ DATA_DIR: dir }).sessionSecret;
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(readFileSync(join(dir, 'session-secret'), 'utf8').trim()).toBe(first);
    expect(loadConfig({ DATA_DIR: dir }).sessionSecret).toBe(first);
  });

  it('makes cookies Secure when the public address is https', () => {
    const config = loadConfig({ DATA_DIR: dir, PUBLIC_URL: 'https://lab.example.test/' });
    expect(config.secureCookies).toBe(true);
    expect(config.publicUrl).toBe('https://lab.example.test');
  });
});

describe('mail and payment settings', () => {
  it('runs the local fakes by default outside production, with stand-in payment keys', () => {
    const config = loadConfig({ DATA_DIR: dir });
    expect(config.localFakes).toBe(true);
    expect(config.smtp).toMatchObject({ host: '127.0.0.1', port: 0, secure: false });
    expect(config.payment.apiBase).toBeNull();
    expect(config.payment.secretKey).toMatch(/^sk_test_/);
  });

  it('names every provider setting missing when the local fakes are off', () => {
    expect(() => loadConfig({ DATA_DIR: dir, LOCAL_FAKES: 'false' })).toThrow(
      /PAYMENT_API_BASE: required when LOCAL_FAKES is false[\s\S]*SMTP_PORT: required/,
    );
  });

  it('points at the hosted services by configuration alone', () => {
    const config = loadConfig({
      DATA_DIR: dir,
      LOCAL_FAKES: 'false',
      SMTP_HOST: 'mail.lab.test',
      SMTP_PORT: '587',
      PAYMENT_API_BASE: 'https://payments.example.test/',
      PAYMENT_SECRET_KEY: 'sk_live_abcdefgh',
      PAYMENT_WEBHOOK_SECRET: 'whsec_abcdefgh',
    });
    expect(config.localFakes).toBe(false);
    expect(config.smtp).toMatchObject({ host: 'mail.lab.test', port: 587 });
    expect(config.payment.apiBase).toBe('https://payments.example.test');
  });
});
