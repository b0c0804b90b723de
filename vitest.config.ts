import { defineConfig } from 'vitest/config';

// Unit and integration tests only: the Playwright specs under tests/e2e run through `npm run e2e`.
export default defineConfig({
  test: {
    include: ['tests/core/**/*.test.ts', 'tests/db/**/*.test.ts', 'tests/cli/**/*.test.ts', 'tests/app/**/*.test.ts'],
    testTimeout: 60_000,
    pool: 'forks',
  },
});
