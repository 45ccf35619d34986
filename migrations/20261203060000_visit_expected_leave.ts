import type { Knex } from 'knex';

/** When a person checked in at a site expects to leave: shown to master control, overdue when past. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('site_visits', (t) => {
    t.timestamp('expected_out_at', { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('site_visits', (t) => t.dropColumn('expected_out_at'));
}
