import fs from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { ensureDebianPackage, startMariadb, type MariadbHandle } from '../../server/db/mariadb';
import { buildWebExport, webExportIsStale } from '../../server/web-build';
import { freePort } from './ports';

/**
 * `npm test` owns its services: a private MariaDB on its own port and data folder,
 * Debian's chromium for the browser tests, and a fresh web export when stale.
 */
const root = path.resolve(__dirname, '../..');
export const testDb = { user: 'thawline_test', password: 'thawline-test-pw' };

/** TEST_DB_PORT, or a free loopback port so two checkouts can test at once. */
const pickPort = async () => (process.env.TEST_DB_PORT ? Number(process.env.TEST_DB_PORT) : freePort());

let mariadb: MariadbHandle | null = null;
let runDir: string | null = null;

export async function setup(project: TestProject) {
  const log = (l: string) => console.log(`[test setup] ${l}`);
  ensureDebianPackage('chromium', 'chromium', log);
  ensureDebianPackage('mosquitto', 'mosquitto', log);
  // a fresh data folder per run, its own: two runs in one checkout do not wipe each other's database
  const dataDir = path.join(root, '.data', `test-mariadb-${process.pid}`);
  fs.rmSync(dataDir, { recursive: true, force: true });
  runDir = dataDir;
  const port = await pickPort();
  mariadb = await startMariadb({ dataDir, port, database: 'thawline_test', user: testDb.user, password: testDb.password, log });
  if (webExportIsStale(root)) await buildWebExport(root, log);
  project.provide('dbPort', port);
}

export async function teardown() {
  await mariadb?.stop();
  if (runDir) fs.rmSync(runDir, { recursive: true, force: true });
}

declare module 'vitest' {
  export interface ProvidedContext {
    dbPort: number;
  }
}
