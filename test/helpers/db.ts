import crypto from 'node:crypto';

import type { Knex } from 'knex';
import { inject } from 'vitest';

import { type Config, loadConfig } from '@/server/config';
import { openDb } from '@/server/db/knex';
import { runSeeds } from '@/server/db/sources';

import { testDb } from './global-setup';

/** A database of its own for one test file, migrated (and seeded unless told not to). */
export async function createTestDb(
  opts: { seed?: boolean } = {},
): Promise<{ db: Knex; config: Config; drop: () => Promise<void> }> {
  const name = `t_${crypto.randomBytes(5).toString('hex')}`;
  const config = loadConfig({
    NODE_ENV: 'test',
    DB_PORT: String(inject('dbPort')),
    DB_USER: testDb.user,
    DB_PASSWORD: testDb.password,
    DB_NAME: name,
    DB_MANAGED: '0',
    PORT: '0',
    MQTT_PORT: '0',
    LOG_LEVEL: 'silent',
    SMTP_CATCHER: '0',
    SIMULATOR: '0',
    DATA_DIR: `.data/test-files/${name}`,
  });
  const admin = openDb(config, 'mysql');
  await admin.raw(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.destroy();
  const db = openDb(config);
  await db.migrate.latest();
  if (opts.seed !== false) await runSeeds(db);
  return {
    db,
    config,
    async drop() {
      await db.raw(`DROP DATABASE \`${name}\``);
      await db.destroy();
    },
  };
}
