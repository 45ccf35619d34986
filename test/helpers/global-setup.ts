import fs from 'node:fs';
import path from 'node:path';

import type { TestProject } from 'vitest/node';

import { ensureDebianPackage, type MariadbHandle, startMariadb } from '@/server/db/mariadb';
import { buildWebExport, webExportIsStale } from '@/server/web-build';

import { freePort } from './ports';

/**
 * `npm test` owns its services: a private MariaDB on its own port and data folder,
 * Debian's chromium for the browser tests, and a fresh web export when stale.
 */
const root = path.resolve(__dirname, '../..');
export const testDb = { user: 'thawline_test', password: 'thawline-test-pw' };

/** A free loopback port for each tier's database, so tiers and checkouts can test at once. */
const pickPort = () => freePort();

export async function setup(project: TestProject) {
  const log = (l: string) => console.log(`[test setup] ${l}`);
  // each tier takes only what it uses: the browser and the web export for e2e, mosquitto for the pipeline
  if (project.name === 'e2e') ensureDebianPackage('chromium', 'chromium', log);
  if (project.name === 'pipeline') ensureDebianPackage('mosquitto', 'mosquitto', log);
  // a fresh data folder per run, its own: two runs in one checkout do not wipe each other's database
  const dataDir = path.join(root, '.data', `test-mariadb-${process.pid}-${project.name}`);
  fs.rmSync(dataDir, { recursive: true, force: true });
  const port = await pickPort();
  const mariadb: MariadbHandle = await startMariadb({
    dataDir,
    port,
    database: 'thawline_test',
    user: testDb.user,
    password: testDb.password,
    log,
  });
  if (project.name === 'e2e' && webExportIsStale(root)) await buildWebExport(root, log);
  project.provide('dbPort', port);
  // each tier stops its own database
  return async () => {
    await mariadb.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}

declare module 'vitest' {
  export interface ProvidedContext {
    dbPort: number;
  }
}
