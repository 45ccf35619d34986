import knexFactory, { type Knex } from 'knex';

import { knexConfig } from '@/knexfile';
import type { Config } from '@/server/config';

import { runSeeds } from './sources';

export function openDb(config: Config, database = config.DB_NAME, poolMax?: number): Knex {
  const c = knexConfig(config, database);
  return knexFactory(poolMax ? { ...c, pool: { ...c.pool, max: poolMax } } : c);
}

/**
 * Runs `work` holding a named MariaDB lock on one connection, so that several
 * instances starting together do it one after another (the others wait, then find
 * nothing left to do). Through one node of a Galera cluster the lock holds for all.
 */
export async function withLock<T>(db: Knex, name: string, work: () => Promise<T>, waitS = 300): Promise<T> {
  const conn = await db.client.acquireConnection();
  try {
    const [rows] = (await db.raw('SELECT GET_LOCK(?, ?) AS got', [name, waitS]).connection(conn)) as [
      { got: number }[],
    ];
    if (Number(rows[0]?.got) !== 1) throw new Error(`could not take the "${name}" lock within ${waitS} s`);
    try {
      return await work();
    } finally {
      await db.raw('SELECT RELEASE_LOCK(?)', [name]).connection(conn);
    }
  } finally {
    await db.client.releaseConnection(conn);
  }
}

/** Brings the schema up to date and seeds the demo scenario when there are no people yet; one instance at a time. */
export async function prepareDb(db: Knex, opts: { seedWhenEmpty: boolean }): Promise<{ seeded: boolean }> {
  return withLock(db, 'thawline-migrate', () => migrateAndSeed(db, opts));
}

async function migrateAndSeed(db: Knex, opts: { seedWhenEmpty: boolean }): Promise<{ seeded: boolean }> {
  await db.migrate.latest();
  if (!opts.seedWhenEmpty) return { seeded: false };
  const row = await db('people').count<{ n: number }[]>({ n: '*' }).first();
  if (Number(row?.n ?? 0) > 0) return { seeded: false };
  await runSeeds(db);
  return { seeded: true };
}
