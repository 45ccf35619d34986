import type { Knex } from 'knex';

import { type Config, loadConfig } from './server/config';
import { migrationSource } from './server/db/sources';

/** Knex settings for a given config; the CLI and the server share this one place. */
export function knexConfig(config: Config, database = config.DB_NAME): Knex.Config {
  return {
    client: 'mysql2',
    connection: {
      host: config.DB_HOST,
      port: config.DB_PORT,
      user: config.DB_USER,
      password: config.DB_PASSWORD,
      database,
      timezone: 'Z',
      dateStrings: false,
      supportBigNumbers: true,
      charset: 'utf8mb4',
    },
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
