import net from 'node:net';

import type { Knex } from 'knex';

import { type Config, loadConfig } from './server/config';
import { migrationSource } from './server/db/sources';

/** DB_HOST as a list of nodes: "host[:port]" separated by commas, DB_PORT where a port is not given. */
export function dbHosts(config: Pick<Config, 'DB_HOST' | 'DB_PORT'>): { host: string; port: number }[] {
  return config.DB_HOST.split(',')
    .map((h) => h.trim())
    .filter(Boolean)
    .map((h) => {
      const m = /^(.*?)(?::(\d+))?$/.exec(h)!;
      return { host: m[1], port: m[2] ? Number(m[2]) : config.DB_PORT };
    });
}

const reachable = (h: { host: string; port: number }) =>
  new Promise<boolean>((resolve) => {
    const s = net.connect(h);
    const done = (ok: boolean) => {
      s.destroy();
      resolve(ok);
    };
    s.setTimeout(500, () => done(false));
    s.once('connect', () => done(true));
    s.once('error', () => done(false));
  });

/**
 * With several nodes (a Galera cluster), every new connection goes to the first
 * node in the list that answers: all instances write through one node while it
 * is up (no certification conflicts between nodes, GET_LOCK holds across them)
 * and move to the next when it goes away. One node: no probe at all.
 */
function failover(config: Config) {
  const hosts = dbHosts(config);
  if (hosts.length === 1) return hosts[0];
  return async () => {
    for (const h of hosts) if (await reachable(h)) return h;
    return hosts[0];
  };
}

/** Knex settings for a given config; the CLI and the server share this one place. */
export function knexConfig(config: Config, database = config.DB_NAME): Knex.Config {
  const target = failover(config);
  const rest = {
    user: config.DB_USER,
    password: config.DB_PASSWORD,
    database,
    timezone: 'Z',
    dateStrings: false,
    supportBigNumbers: true,
    charset: 'utf8mb4',
  };
  return {
    client: 'mysql2',
    // knex keeps a function's answer until it says it has expired: here after a second, so new connections
    // choose again soon after a node goes (an answer that is always expired makes knex wait for ever)
    connection:
      typeof target === 'function'
        ? async () => {
            const at = Date.now();
            return { ...rest, ...(await target()), expirationChecker: () => Date.now() - at > 1000 };
          }
        : { ...rest, ...target },
    pool: { min: 0, max: 10 },
    // during a database outage a request waits 5 s at most for a connection, then answers 503
    acquireConnectionTimeout: 5000,
    // knex warns once per failed connection attempt, several a second during an outage;
    // the outage is reported by health, ingest and a system event instead
    log: {
      warn: (m: string) => {
        if (!String(m).startsWith('Acquire connection error')) console.warn(m);
      },
    },
    migrations: { migrationSource, tableName: 'knex_migrations' },
  };
}

export default knexConfig(loadConfig());
