import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join, resolve } from 'node:path';
import { z } from 'zod';
import { parseTrustProxy, type TrustProxy } from './trust-proxy';

const intFromEnv = (min: number, max: number) => z.coerce.number().int().min(min).max(max);

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  // 4300: chosen for Clearbase so it does not collide with the Angular dev server's 4200
  PORT: intFromEnv(1, 65535).default(4300),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATA_DIR: z.string().min(1).default('./data'),
  SESSION_SECRET: z.string().min(32, 'Use at least 32 characters').optional(),
  PUBLIC_URL: z.url().optional(),
  // off unless set: only a proxy we were told of may name the client (parsed by parseTrustProxy)
  TRUST_PROXY: z.string().optional(),
  // one working day: common practice for staff web applications, from memory
  SESSION_MAX_AGE_HOURS: intFromEnv(1, 24 * 90).default(12),
  // 1 MB is ample for JSON requests; files travel as multipart, not JSON (our choice)
  JSON_BODY_LIMIT_BYTES: intFromEnv(1024, 50 * 1024 * 1024).default(1024 * 1024),
  // 10 failed sign-ins per 15 minutes per address and e-mail: common practice against password guessing, from memory
  LOGIN_RATE_LIMIT_MAX: intFromEnv(1, 10_000).default(10),
  LOGIN_RATE_LIMIT_WINDOW_MINUTES: intFromEnv(1, 24 * 60).default(15),
  // 30 failed sign-ins per window from one address across all e-mails: one password tried on many accounts stops
  // early, while a shop counter where many customers mistype still gets through (our choice)
  LOGIN_RATE_LIMIT_ADDRESS_MAX: intFromEnv(1, 100_000).default(30),
  // the Angular build's output folder (angular.json outputPath + /browser)
  WEB_ROOT: z.string().min(1).default('dist/web/browser'),
  SEED_DEMO: z.enum(['true', 'false']).default('true'),
  // 1 GiB: a 16-bit RGB scan of a 6x7 frame at 4000 ppi is about 630 MB uncompressed (our arithmetic, with room)
  UPLOAD_MAX_FILE_BYTES: intFromEnv(1024, 8 * 1024 ** 3).default(1024 ** 3),
  // 100 files: a 36-exposure roll with leader, ends and retakes, with room (our choice)
  UPLOAD_MAX_FILES: intFromEnv(1, 1000).default(100),
  // 120 MP: a 6x7 frame at 4000 ppi is about 105 MP, common practice of the trade, from memory
  UPLOAD_MAX_PIXELS: intFromEnv(1, 1_000_000_000).default(120_000_000),
  // 1 GiB: the bytes of one 105 MP 16-bit scan (630 MB) or of seven 24 MP ones (144 MB each) at once (our arithmetic)
  UPLOAD_VALIDATION_MEMORY_MB: intFromEnv(64, 1024 * 1024).default(1024),
  // frames inverted at once; default one per core so the worker pool stays busy (our choice)
  JOB_CONCURRENCY: intFromEnv(1, 256).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  // local stand-ins for the mail server and the payment provider; on by default except in production (our choice)
  LOCAL_FAKES: z.enum(['true', 'false']).optional(),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  // 0 with local fakes: the mail catcher takes any free port and the outbox sends there (our choice)
  SMTP_PORT: intFromEnv(0, 65535).default(0),
  SMTP_SECURE: z.enum(['true', 'false']).default('false'),
  SMTP_USER: z.string().min(1).optional(),
  SMTP_PASSWORD: z.string().min(1).optional(),
  MAIL_FROM: z.email('Enter an e-mail address').default('no-reply@clearbase.invalid'),
  PAYMENT_API_BASE: z.url().optional(),
  PAYMENT_SECRET_KEY: z.string().min(8).optional(),
  PAYMENT_WEBHOOK_SECRET: z.string().min(8).optional(),
  // 0: the payment fake takes any free port (our choice)
  PAYMENT_FAKE_PORT: intFromEnv(0, 65535).default(0),
  // 5 sign-ups per hour per address: enough for a family at one counter, little for a script (our choice)
  SIGNUP_RATE_LIMIT_MAX: intFromEnv(1, 10_000).default(5),
  SIGNUP_RATE_LIMIT_WINDOW_MINUTES: intFromEnv(1, 24 * 60).default(60),
  // a week (168 h) gives a customer time to fetch a large order; at most 90 days, so old links die (our choice)
  DOWNLOAD_LINK_HOURS: intFromEnv(1, 24 * 90).default(168),
  // hourly: abandoned sign-ups and spent links only take room, nothing reads them (our choice)
  SIGNUP_CLEANUP_INTERVAL_MINUTES: intFromEnv(1, 7 * 24 * 60).default(60),
});

/** The server's settings, validated from the environment once at start-up. */
export interface Config {
  nodeEnv: 'development' | 'production' | 'test';
  port: number;
  host: string;
  dataDir: string;
  sessionSecret: string;
  publicUrl: string;
  /** True when PUBLIC_URL is https: cookies are Secure and HSTS is sent. */
  secureCookies: boolean;
  /** The proxies allowed to name the client's address (TRUST_PROXY); false trusts none. */
  trustProxy: TrustProxy;
  sessionMaxAgeMs: number;
  jsonBodyLimitBytes: number;
  /** Failed sign-ins allowed per window: `max` per address and e-mail, `addressMax` per address over all e-mails. */
  loginRateLimit: { max: number; addressMax: number; windowMs: number };
  /** Folder of the built web app, served with a fallback to its index.html. */
  webRoot: string;
  seedDemo: boolean;
  logLevel: string;
  /** Limits of one upload request of negative scans. */
  uploads: {
    maxFileBytes: number;
    maxFiles: number;
    maxPixels: number;
    /** Decoded bytes the scans being validated at once may hold together; the rest wait their turn. */
    validationMemoryBytes: number;
  };
  /** Frames the inversion queue works on at once. */
  jobConcurrency: number;
  /** True when the mail catcher and the payment fake run inside this server instead of the hosted services. */
  localFakes: boolean;
  smtp: SmtpSettings;
  payment: PaymentSettings;
  signupRateLimit: { max: number; windowMs: number };
  /** How long a mailed or handed-out download link works. */
  downloadLinkHours: number;
  /** How often unconfirmed sign-ups and spent password links are removed. */
  signupCleanupIntervalMs: number;
}

/** Where the outbox hands mail over. With local fakes, port 0 means "the port the catcher got". */
export interface SmtpSettings {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  password?: string;
  from: string;
}

/** The payment provider's API. With local fakes, apiBase is filled in once the fake listens. */
export interface PaymentSettings {
  apiBase: string | null;
  secretKey: string;
  webhookSecret: string;
  fakePort: number;
}

// Stand-in keys for the local payment fake only; they open nothing anywhere else (our choice)
const localPaymentSecretKey = 'sk_test_clearbase_local';
const localWebhookSecret = 'whsec_clearbase_local';

/** Thrown when an environment variable has a bad value; the message names the variable. */
export class ConfigError extends Error {
  override readonly name = 'ConfigError';
}

/**
 * Reads and validates the environment. In production SESSION_SECRET is required; elsewhere one is generated on first
 * start and kept in DATA_DIR/session-secret so sessions survive restarts.
 *
 * @example
 * const config = loadConfig(process.env); // throws ConfigError naming e.g. PORT
 */
export function loadConfig(env: Record<string, string | undefined>): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => {
      const name = issue.path.join('.');
      return `${name}: ${issue.message} (received ${JSON.stringify(env[name] ?? null)})`;
    });
    throw new ConfigError(`Invalid environment:\n  ${lines.join('\n  ')}`);
  }
  const e = parsed.data;
  const dataDir = resolve(e.DATA_DIR);
  let sessionSecret = e.SESSION_SECRET;
  if (!sessionSecret) {
    if (e.NODE_ENV === 'production') {
      throw new ConfigError(
        'Invalid environment:\n  SESSION_SECRET: required in production (at least 32 characters)',
      );
    }
    sessionSecret = readOrCreateSecret(dataDir);
  }
  const localFakes = e.LOCAL_FAKES ? e.LOCAL_FAKES === 'true' : e.NODE_ENV !== 'production';
  if (!localFakes) {
    const missing: string[] = (
      ['PAYMENT_API_BASE', 'PAYMENT_SECRET_KEY', 'PAYMENT_WEBHOOK_SECRET'] as const
    ).filter((name) => !e[name]);
    if (e.SMTP_PORT === 0) missing.push('SMTP_PORT');
    if (missing.length) {
      throw new ConfigError(
        `Invalid environment:\n  ${missing
          .map((name) => `${name}: required when LOCAL_FAKES is false`)
          .join('\n  ')}`,
      );
    }
  }
  let trustProxy: TrustProxy;
  try {
    trustProxy = parseTrustProxy(e.TRUST_PROXY);
  } catch (err) {
    throw new ConfigError(`Invalid environment:\n  ${(err as Error).message}`);
  }
  const publicUrl = (e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, '');
  return {
    nodeEnv: e.NODE_ENV,
    port: e.PORT,
    host: e.HOST,
    dataDir,
    sessionSecret,
    publicUrl,
    secureCookies: publicUrl.startsWith('https://'),
    trustProxy,
    sessionMaxAgeMs: e.SESSION_MAX_AGE_HOURS * 3600_000,
    jsonBodyLimitBytes: e.JSON_BODY_LIMIT_BYTES,
    loginRateLimit: {
      max: e.LOGIN_RATE_LIMIT_MAX,
      addressMax: e.LOGIN_RATE_LIMIT_ADDRESS_MAX,
      windowMs: e.LOGIN_RATE_LIMIT_WINDOW_MINUTES * 60_000,
    },
    webRoot: resolve(e.WEB_ROOT),
    seedDemo: e.SEED_DEMO === 'true',
    logLevel: e.LOG_LEVEL,
    uploads: {
      maxFileBytes: e.UPLOAD_MAX_FILE_BYTES,
      maxFiles: e.UPLOAD_MAX_FILES,
      maxPixels: e.UPLOAD_MAX_PIXELS,
      validationMemoryBytes: e.UPLOAD_VALIDATION_MEMORY_MB * 1024 ** 2,
    },
    jobConcurrency: e.JOB_CONCURRENCY ?? availableParallelism(),
    localFakes,
    smtp: {
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      secure: e.SMTP_SECURE === 'true',
      ...(e.SMTP_USER ? { user: e.SMTP_USER } : {}),
      ...(e.SMTP_PASSWORD ? { password: e.SMTP_PASSWORD } : {}),
      from: e.MAIL_FROM,
    },
    payment: {
      apiBase: e.PAYMENT_API_BASE ? e.PAYMENT_API_BASE.replace(/\/$/, '') : null,
      secretKey: e.PAYMENT_SECRET_KEY ?? localPaymentSecretKey,
      webhookSecret: e.PAYMENT_WEBHOOK_SECRET ?? localWebhookSecret,
      fakePort: e.PAYMENT_FAKE_PORT,
    },
    signupRateLimit: {
      max: e.SIGNUP_RATE_LIMIT_MAX,
      windowMs: e.SIGNUP_RATE_LIMIT_WINDOW_MINUTES * 60_000,
    },
    downloadLinkHours: e.DOWNLOAD_LINK_HOURS,
    signupCleanupIntervalMs: e.SIGNUP_CLEANUP_INTERVAL_MINUTES * 60_000,
  };
}

function readOrCreateSecret(dataDir: string): string {
  const file = join(dataDir, 'session-secret');
  try {
    const existing = readFileSync(file, 'utf8').trim();
    if (existing.length >= 32) return existing;
  } catch {
    // first start: no secret yet
  }
  mkdirSync(dataDir, { recursive: true });
  // 32 random bytes: the HMAC-SHA256 key length, RFC 2104 section 3
  const secret = randomBytes(32).toString('base64url');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}
