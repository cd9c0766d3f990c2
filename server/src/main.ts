import type { Server } from 'node:http';
import { join } from 'node:path';
import { createApp } from './app';
import { KyselySessionStore } from './auth/kysely-session-store';
import type { BackgroundService } from './background-service';
import { systemClock } from './clock';
import { ConfigError, loadConfig } from './config/config';
import { databaseFileName } from './db/database-file';
import { migrateToLatest } from './db/migrate';
import { openDatabase } from './db/open-database';
import { demoPassword, demoUsers, seedDemo } from './demo/seed';
import { createJobRunner } from './jobs/job-runner';
import { closeRollStreams } from './jobs/roll-events';
import { createLogger } from './logging/create-logger';
import { mailServices } from './mail/mail-services';
import { paymentFakeServices } from './payment-fake/payment-fake-service';
import { signupCleanupService } from './signup/signup-cleanup';
import { settleAfterResponse } from './http/after-response';

// hourly: expired sessions are refused on read anyway; pruning only keeps the table small (our choice)
const sessionPruneIntervalMs = 3600_000;
// 10 s for open connections to finish before we stop waiting: common practice for graceful shutdown, from memory
const shutdownGraceMs = 10_000;

function loadConfigOrExit() {
  try {
    return loadConfig(process.env);
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(err.message);
      process.exit(1);
    }
    throw err;
  }
}

const config = loadConfigOrExit();
const logger = createLogger(config.logLevel);
const db = openDatabase(join(config.dataDir, databaseFileName));
const applied = await migrateToLatest(db).catch((err: Error) => {
  console.error(`Could not migrate the database in ${config.dataDir}: ${err.message}`);
  process.exit(1);
});
if (applied.length) logger.info({ applied }, 'migrated the database');
const seeded = config.seedDemo ? await seedDemo(db, { clock: systemClock }) : false;

let pruneTimer: NodeJS.Timeout | undefined;
const services: BackgroundService[] = [
  {
    name: 'session pruning',
    start() {
      const store = new KyselySessionStore(db, systemClock, config.sessionMaxAgeMs);
      const prune = () =>
        store.prune().catch((err: unknown) => logger.warn({ err }, 'session pruning failed'));
      void prune();
      pruneTimer = setInterval(prune, sessionPruneIntervalMs);
      pruneTimer.unref();
    },
    stop() {
      clearInterval(pruneTimer);
    },
  },
];
services.push(...mailServices(config, { db, clock: systemClock, logger }));
services.push(...paymentFakeServices(config, logger));
services.push(
  signupCleanupService({ db, clock: systemClock, logger, intervalMs: config.signupCleanupIntervalMs }),
);
// started before listening, so its sweep of unfinished temp files never meets an upload; stopped first, it drains
services.push(createJobRunner({ db, config, clock: systemClock, logger }));

const started: BackgroundService[] = [];
for (const service of services) {
  await service.start();
  started.push(service);
  logger.debug({ service: service.name }, 'started');
}

const app = createApp({ db, config, clock: systemClock, logger });
const server: Server = app.listen(config.port, config.host);
await new Promise<void>((resolve, reject) => {
  server.once('listening', resolve);
  server.once('error', reject);
}).catch((err: NodeJS.ErrnoException) => {
  console.error(
    err.code === 'EADDRINUSE'
      ? `PORT ${config.port} on ${config.host} is already in use; set PORT to another.`
      : err.message,
  );
  process.exit(1);
});

const lines = [
  `Clearbase is listening on http://${config.host}:${config.port}` +
    (config.publicUrl.startsWith(`http://${config.host}:`) ? '' : ` (public address ${config.publicUrl})`),
];
lines.push(`Data folder: ${config.dataDir}`);
if (seeded) {
  lines.push(`Demo lab seeded. Sign in with password "${demoPassword}" as:`);
  for (const u of demoUsers) lines.push(`  ${u.email.padEnd(30)} ${u.role}`);
} else if (config.seedDemo) {
  lines.push(
    `Demo accounts (if this data folder was seeded): ${demoUsers
      .slice(0, 4)
      .map((u) => u.email)
      .join(', ')} / ${demoPassword}`,
  );
}
console.log(lines.join('\n'));

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'shutting down');
  const force = setTimeout(() => server.closeAllConnections(), shutdownGraceMs);
  force.unref();
  // live roll streams never go idle; end them so the server can close
  closeRollStreams(db);
  await new Promise<void>((resolve) => {
    server.close(() => resolve());
    server.closeIdleConnections();
  });
  // mail a reset link asked for just before the signal, before the database closes
  await settleAfterResponse();
  for (const service of started.reverse()) {
    try {
      await service.stop();
    } catch (err) {
      logger.warn({ err, service: service.name }, 'service did not stop cleanly');
    }
  }
  await db.destroy();
  process.exit(0);
}
process.once('SIGTERM', () => void shutdown('SIGTERM'));
process.once('SIGINT', () => void shutdown('SIGINT'));
