import knexFactory, { type Knex } from 'knex';

import { knexConfig } from '@/knexfile';
import type { Config } from '@/server/config';

import { runSeeds } from './sources';

export function openDb(config: Config, database = config.DB_NAME, poolMax?: number): Knex {
  const c = knexConfig(config, database);
  return knexFactory(poolMax ? { ...c, pool: { ...c.pool, max: poolMax } } : c);
}

/** Brings the schema up to date and seeds the demo scenario when there are no people yet. */
export async function prepareDb(db: Knex, opts: { seedWhenEmpty: boolean }): Promise<{ seeded: boolean }> {
  await db.migrate.latest();
  if (!opts.seedWhenEmpty) return { seeded: false };
  const row = await db('people').count<{ n: number }[]>({ n: '*' }).first();
  if (Number(row?.n ?? 0) > 0) return { seeded: false };
  await runSeeds(db);
  return { seeded: true };
}
