import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['telemetry/**/*.test.ts', 'server/**/*.test.ts', 'simulator/**/*.test.ts', 'components/**/*.test.{ts,tsx}', 'test/**/*.test.ts'],
    globalSetup: ['test/helpers/global-setup.ts'],
    environment: 'node',
    pool: 'forks',
    maxWorkers: 2,
    testTimeout: 30_000,
    hookTimeout: 120_000,
  },
});
