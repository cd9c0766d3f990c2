import { defineConfig } from 'vitest/config';

// Browser tests: one real server per file, one Chromium at a time (these machines have two cores).
export default defineConfig({
  test: {
    include: ['e2e/**/*.e2e.ts'],
    environment: 'node',
    testTimeout: 90_000,
    // a file's beforeAll starts its own server, which takes up to three minutes on a busy machine
    hookTimeout: 240_000,
    fileParallelism: false,
    pool: 'forks',
    // expect.poll waits for state; its default of 1 s is too short for a busy machine (a preview, a render job)
    expect: { poll: { timeout: 20_000 } },
  },
});
