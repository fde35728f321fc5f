import { defineConfig } from 'vitest/config';

// Three projects: `shared` and `client` are pure code (no database, they run in a second); `server` needs PostgreSQL,
// which tests/setup/global-setup.ts starts (a throwaway cluster, or DATABASE_URL) and migrates once.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'shared',
          include: ['tests/shared/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          // The client's logic that needs no browser (address parsing, formatting).
          name: 'client',
          include: ['tests/src/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts', 'tests/bin/**/*.test.ts', 'tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/global-setup.ts'],
          setupFiles: ['tests/setup/setup-test-env.ts'],
          testTimeout: 60_000,
          hookTimeout: 300_000,
        },
      },
    ],
  },
});
