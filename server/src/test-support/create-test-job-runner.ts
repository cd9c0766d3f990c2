import { pino } from 'pino';
import { createJobRunner, type JobRunner, type JobRunnerOptions } from '../jobs/job-runner';
import type { TestApp } from './test-app';

/**
 * The inversion queue of a test app, not yet started: one job at a time, one worker thread, silent, polling every
 * 50 ms; `overrides` change any of that (a lease, a hook after each frame).
 * @example const runner = createTestJobRunner(t, { afterFrame: (id) => seen.push(id) }); await runner.start();
 */
export function createTestJobRunner(t: TestApp, overrides: Partial<JobRunnerOptions> = {}): JobRunner {
  return createJobRunner({
    db: t.db,
    config: { ...t.config, jobConcurrency: 1 },
    clock: { now: () => new Date() },
    logger: pino({ level: 'silent' }),
    threads: 1,
    pollMs: 50,
    ...overrides,
  });
}
