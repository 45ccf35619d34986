import type { Knex } from 'knex';
import { loadConfig, type Config } from './server/config';
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
    migrations: { migrationSource, tableName: 'knex_migrations' },
  };
}

export default knexConfig(loadConfig());
