import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

const alias = {
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
  '@': fileURLToPath(new URL('./src', import.meta.url)),
};

// Four suites: pure unit tests (node), client component tests (jsdom),
// API integration tests against the real app on a temporary PGlite data dir,
// and browser tests driving Debian's chromium through playwright-core.
export default defineConfig({
  resolve: { alias },
  test: {
    globals: true,
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          globals: true,
          environment: 'node',
          include: ['tests/unit/**/*.test.ts', 'tests/electrical/**/*.test.ts', 'tests/fuzz/diagram-files.fuzz.test.ts', 'tests/fuzz/network-files.fuzz.test.ts'],
          setupFiles: ['tests/helpers/fast-check-config.ts'],
          testTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'client',
          globals: true,
          environment: 'jsdom',
          include: ['tests/client/**/*.test.tsx'],
          setupFiles: ['tests/client/setup.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          globals: true,
          environment: 'node',
          include: ['tests/integration/**/*.test.ts', 'tests/fuzz/api-bodies.fuzz.test.ts', 'tests/security/**/*.test.ts', 'tests/faults/**/*.test.ts'],
          setupFiles: ['tests/helpers/fast-check-config.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          globals: true,
          environment: 'node',
          include: ['tests/browser/**/*.test.ts'],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
