import { type ChildProcess, fork } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

import { bundle, serverNodeArgs } from '@/server/bundle';
import { type Config, loadConfig, projectRoot } from '@/server/config';
import { openDb } from '@/server/db/knex';
import { startMariadb } from '@/server/db/mariadb';
import { runSeeds } from '@/server/db/sources';
import { freePort } from '@/test/helpers/ports';

/** A private, fresh MariaDB for one benchmark, migrated and seeded, on free loopback ports. */
export async function benchDb(name: string) {
  const root = projectRoot();
  const dataDir = path.join(root, '.data', `bench-${name}-mariadb`);
  fs.rmSync(dataDir, { recursive: true, force: true });
  const dbPort = await freePort();
  const maria = await startMariadb({
    dataDir,
    port: dbPort,
    database: 'bench',
    user: 'bench',
    password: 'bench-password',
  });
  const config = loadConfig({
    ...process.env,
    NODE_ENV: 'production',
    DB_PORT: String(dbPort),
    DB_NAME: 'bench',
    DB_USER: 'bench',
    DB_PASSWORD: 'bench-password',
    DB_MANAGED: '0',
    PORT: '0',
    MQTT_PORT: '0',
    LOG_LEVEL: 'warn',
    SMTP_PORT: String(await freePort()),
    DATA_DIR: path.join(dataDir, 'files-app'),
    DEVICE_KEY: crypto.randomBytes(32).toString('hex'),
  });
  const db = openDb(config);
  await db.migrate.latest();
  await runSeeds(db);
  return {
    root,
    config,
    db,
    async stop() {
      await db.destroy();
      await maria.stop();
    },
  };
}

/** Runs a benchmark's body and always stops its database; a run past `limitMs` fails with a message instead of hanging. */
export async function runBench(
  name: string,
  body: (b: Awaited<ReturnType<typeof benchDb>>) => Promise<void>,
  limitMs = 10 * 60_000,
) {
  const b = await benchDb(name);
  const watchdog = setTimeout(() => {
    console.error(`bench:${name} did not finish within ${limitMs / 60_000} min; stopping`);
    void b.stop().finally(() => process.exit(1));
  }, limitMs);
  watchdog.unref();
  try {
    await body(b);
  } catch (e) {
    console.error(e);
    process.exitCode = 1;
  } finally {
    clearTimeout(watchdog);
    await b.stop();
  }
}

/** The environment a forked server needs to use a bench database, on free loopback ports. */
export async function serverEnv(config: Config): Promise<NodeJS.ProcessEnv> {
  return {
    ...process.env,
    NODE_ENV: 'production' as const,
    DB_PORT: String(config.DB_PORT),
    DB_NAME: config.DB_NAME,
    DB_USER: config.DB_USER,
    DB_PASSWORD: config.DB_PASSWORD,
    DB_MANAGED: '0',
    PORT: String(await freePort()),
    MQTT_PORT: String(await freePort()),
    SMTP_PORT: String(config.SMTP_PORT),
    DEVICE_KEY: config.DEVICE_KEY,
    DATA_DIR: config.DATA_DIR,
    LOG_LEVEL: 'warn',
  };
}

/** Starts `server-process.ts` with `env`, bundled and under plain node as the server ships; resolves once it listens. */
export async function forkServer(env: NodeJS.ProcessEnv): Promise<ChildProcess> {
  const file = await bundle(projectRoot(), 'test/bench/server-process.ts', 'build/bench/server-process.cjs');
  return new Promise((resolve, reject) => {
    const child = fork(file, [], { execArgv: serverNodeArgs, env });
    child.once('message', () => resolve(child));
    child.once('exit', (code) => reject(new Error(`bench server exited (${code}) before it was ready`)));
  });
}

/** Stops a forked server and waits for it to exit. */
export async function stopServer(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM') {
  const gone = new Promise((r) => child.once('exit', r));
  child.kill(signal);
  await gone;
}
