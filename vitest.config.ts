import { defineConfig } from 'vitest/config';

// Tests import workspace packages through their "source" export condition, so no
// build is needed to run them; `pnpm test` still builds first to type-check.
export default defineConfig({
  resolve: { conditions: ['source', 'module', 'node', 'import', 'default'] },
  test: {
    include: ['packages/*/test/**/*.test.ts', 'tests/**/*.test.ts'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
