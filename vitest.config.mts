import path from 'node:path';
import { fileURLToPath } from 'node:url';

import { defineConfig } from 'vitest/config';

const root = path.dirname(fileURLToPath(import.meta.url));

/**
 * Four tiers, each saying what it needs:
 *   unit      pure code, no set-up at all (`npx vitest run --project unit` starts no database and no browser)
 *   api       the Express app or the whole server on a private MariaDB
 *   pipeline  broker → ingest → MariaDB, restarts and outages
 *   e2e       Debian's chromium against the whole server and the web export
 * `npm test` runs all four.
 */
const withDb = { globalSetup: ['test/helpers/global-setup.ts'], testTimeout: 30_000, hookTimeout: 120_000 };

export default defineConfig({
  // the @/ path alias of tsconfig.json
  resolve: { alias: [{ find: /^@\//, replacement: `${root}/` }] },
  test: {
    environment: 'node',
    pool: 'forks',
    maxWorkers: 2,
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: [
            'telemetry/**/*.test.ts',
            'server/**/*.test.ts',
            'simulator/**/*.test.ts',
            'components/**/*.test.{ts,tsx}',
          ],
        },
      },
      { extends: true, test: { name: 'api', include: ['test/api/**/*.test.ts'], ...withDb } },
      { extends: true, test: { name: 'pipeline', include: ['test/pipeline/**/*.test.ts'], ...withDb } },
      { extends: true, test: { name: 'e2e', include: ['test/e2e/**/*.test.ts'], ...withDb } },
    ],
  },
});
