import { defineConfig } from 'vitest/config';

// Tests import workspace packages through their "source" export condition, so they run
// straight from src/ with no build; `pnpm test` still builds first to type-check.
// Vitest's node tests resolve through the SSR settings, so the condition is given there too.
const conditions = ['source', 'module', 'node', 'import', 'default'];

export default defineConfig({
  resolve: { conditions },
  ssr: { resolve: { conditions, externalConditions: ['source'] } },
  test: {
    include: ['packages/*/test/**/*.test.ts', 'tests/**/*.test.ts'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
