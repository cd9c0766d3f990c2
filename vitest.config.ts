import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  resolve: {
    alias: {
      '@clearbase/inversion': here('./libs/inversion/src/index.ts'),
      // the longer name first: an alias also matches names that start with it
      '@clearbase/contracts/values': here('./libs/contracts/src/values/index.ts'),
      '@clearbase/contracts': here('./libs/contracts/src/index.ts'),
    },
  },
  test: {
    include: ['libs/**/*.test.ts', 'server/**/*.test.ts', 'migrations/**/*.test.ts', 'bench/**/*.test.ts'],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 30_000,
    pool: 'forks',
  },
});
