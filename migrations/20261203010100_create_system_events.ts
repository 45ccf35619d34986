import type { Knex } from 'knex';

/** Events of the system itself (start, crash restart, database outage), recorded once each. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('system_events', (t) => {
    t.bigIncrements('id');
    t.timestamp('at', { precision: 3 }).notNullable();
    t.string('kind', 40).notNullable();
    t.string('message', 500).notNullable();
    t.json('details').nullable();
    t.index(['at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('system_events');
}
