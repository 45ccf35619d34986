import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { createTestDb } from '@/test/helpers/db';

let t: Awaited<ReturnType<typeof createTestDb>>;
beforeAll(async () => {
  t = await createTestDb({ seed: false });
});
afterAll(async () => {
  await t.drop();
});

describe('the schema on a Galera cluster', () => {
  it('gives every table a primary key (Galera replicates and certifies rows by key)', async () => {
    const [rows] = (await t.db.raw(
      `SELECT t.TABLE_NAME AS name FROM information_schema.TABLES t
       WHERE t.TABLE_SCHEMA = DATABASE() AND t.TABLE_TYPE = 'BASE TABLE'
         AND NOT EXISTS (SELECT 1 FROM information_schema.TABLE_CONSTRAINTS c
                         WHERE c.TABLE_SCHEMA = t.TABLE_SCHEMA AND c.TABLE_NAME = t.TABLE_NAME
                           AND c.CONSTRAINT_TYPE = 'PRIMARY KEY')`,
    )) as [{ name: string }[]];
    expect(rows.map((r) => r.name)).toEqual([]);
  });

  it('uses InnoDB for every table (Galera replicates InnoDB only)', async () => {
    const [rows] = (await t.db.raw(
      `SELECT TABLE_NAME AS name, ENGINE AS engine FROM information_schema.TABLES
       WHERE TABLE_SCHEMA = DATABASE() AND TABLE_TYPE = 'BASE TABLE' AND ENGINE <> 'InnoDB'`,
    )) as [{ name: string }[]];
    expect(rows).toEqual([]);
  });
});
