import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../../server/config';
import { openDb } from '../../server/db/knex';
import { startMariadb } from '../../server/db/mariadb';
import { runSeeds } from '../../server/db/sources';
import { freePort } from '../helpers/ports';

/** A private, fresh MariaDB for one benchmark, migrated and seeded, on free loopback ports. */
export async function benchDb(name: string) {
  const root = path.resolve(__dirname, '../..');
  const dataDir = path.join(root, '.data', `bench-${name}-mariadb`);
  fs.rmSync(dataDir, { recursive: true, force: true });
  const dbPort = await freePort();
  const maria = await startMariadb({ dataDir, port: dbPort, database: 'bench', user: 'bench', password: 'bench-password' });
  const config = loadConfig({
    ...process.env, NODE_ENV: 'production', DB_PORT: String(dbPort), DB_NAME: 'bench', DB_USER: 'bench', DB_PASSWORD: 'bench-password',
    DB_MANAGED: '0', PORT: '0', MQTT_PORT: '0', LOG_LEVEL: 'warn', SMTP_PORT: String(await freePort()),
  });
  const db = openDb(config);
  await db.migrate.latest();
  await runSeeds(db);
  return {
    root, config, db,
    async stop() {
      await db.destroy();
      await maria.stop();
    },
  };
}

/** Runs a benchmark's body and always stops its database. */
export async function runBench(name: string, body: (b: Awaited<ReturnType<typeof benchDb>>) => Promise<void>) {
  const b = await benchDb(name);
  try {
    await body(b);
  } catch (e) {
    console.error(e);
    process.exitCode = 1;
  } finally {
    await b.stop();
  }
}
