import { pino } from 'pino';
import { createJobRunner, type JobRunner } from '../jobs/job-runner';
import type { TestApp } from './test-app';

/**
 * The inversion queue of a test app, started: one job at a time, one worker thread, silent, polling every 50 ms.
 * Stop it before closing the app.
 * @example runner = await startTestJobRunner(t); ... await runner.stop();
 */
export async function startTestJobRunner(t: TestApp): Promise<JobRunner> {
  const runner = createJobRunner({
    db: t.db,
    config: { ...t.config, jobConcurrency: 1 },
    clock: { now: () => new Date() },
    logger: pino({ level: 'silent' }),
    threads: 1,
    pollMs: 50,
  });
  await runner.start();
  return runner;
}
