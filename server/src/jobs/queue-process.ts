/**
 * The inversion queue alone in a process, over an existing data folder: `tsx server/src/jobs/queue-process.ts`.
 * The kill-and-resume test runs it as a child and kills it with SIGKILL mid-roll.
 * Environment: DATA_DIR, DATABASE_FILE, and optionally FRAME_DELAY_MS (a pause after each frame) and LEASE_MS.
 */
import { pino } from 'pino';
import { systemClock } from '../clock';
import { openDatabase } from '../db/open-database';
import { createJobRunner } from './job-runner';

const dataDir = process.env['DATA_DIR'];
const databaseFile = process.env['DATABASE_FILE'];
if (!dataDir || !databaseFile) {
  console.error('Set DATA_DIR and DATABASE_FILE.');
  process.exit(2);
}
const delayMs = Number(process.env['FRAME_DELAY_MS'] ?? 0);
const db = openDatabase(databaseFile);
const runner = createJobRunner({
  db,
  config: { dataDir, jobConcurrency: 1, uploads: { maxPixels: 120_000_000 } },
  clock: systemClock,
  logger: pino({ level: 'silent' }),
  threads: 1,
  pollMs: 50,
  leaseMs: Number(process.env['LEASE_MS'] ?? 30_000),
  afterFrame: async (frameId) => {
    process.stdout.write(`done ${frameId}\n`);
    if (delayMs) await new Promise((r) => setTimeout(r, delayMs));
  },
});
await runner.start();
process.stdout.write('ready\n');
process.once('SIGTERM', () => {
  void Promise.resolve(runner.stop()).then(async () => {
    await db.destroy();
    process.exit(0);
  });
});
