import type { JobRunner, JobRunnerOptions } from '../jobs/job-runner';
import { createTestJobRunner } from './create-test-job-runner';
import type { TestApp } from './test-app';

/**
 * The inversion queue of a test app (see `createTestJobRunner`), started. Stop it before closing the app.
 * @example runner = await startTestJobRunner(t); ... await runner.stop();
 */
export async function startTestJobRunner(
  t: TestApp,
  overrides: Partial<JobRunnerOptions> = {},
): Promise<JobRunner> {
  const runner = createTestJobRunner(t, overrides);
  await runner.start();
  return runner;
}
