import type { Knex } from 'knex';

/**
 * When the server received each reading (the device's own time stays in `ts`), and
 * per controller its current boot, its clock skew and how many readings conflicted
 * with stored ones (same boot and seq, other content).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    t.timestamp('received_at', { precision: 3 }).nullable();
  });
  await knex.schema.alterTable('controllers', (t) => {
    t.string('boot', 32).nullable();
    t.specificType('clock_skew_s', 'FLOAT').nullable();
    t.integer('conflicts').unsigned().notNullable().defaultTo(0);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('controllers', (t) => {
    t.dropColumn('conflicts');
    t.dropColumn('clock_skew_s');
    t.dropColumn('boot');
  });
  await knex.schema.alterTable('readings', (t) => {
    t.dropColumn('received_at');
  });
}
