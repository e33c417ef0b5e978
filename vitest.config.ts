import { defineConfig } from 'vitest/config';

// Two projects: unit tests (OpenCV loaded by tests/setup.ts) and the browser end-to-end tests
// (headless Chromium against the built app in dist-app/; one file at a time, longer timeouts).
export default defineConfig({
  test: {
    pool: 'forks',
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/**/*.test.ts', 'tests/**/*.test.tsx'],
          exclude: ['tests/e2e/**', '**/node_modules/**'],
          setupFiles: ['tests/setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          testTimeout: 180_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
