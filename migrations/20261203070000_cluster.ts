import type { Knex } from 'knex';

/**
 * Several Thawline instances on one database: each heartbeats into `instances`;
 * each controller is owned by one live instance through a lease with a fencing
 * number that grows whenever the holder changes; timed jobs (escalation, mail,
 * retention) run on one instance through a job lease; rate limits are counted here
 * so that every instance sees the same count.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('instances', (t) => {
    t.string('id', 64).primary();
    t.timestamp('started_at', { precision: 3 }).notNullable();
    t.timestamp('heartbeat_at', { precision: 3 }).notNullable();
    t.string('url', 200).nullable();
    t.integer('pid').unsigned().nullable();
    t.integer('owned').unsigned().notNullable().defaultTo(0);
  });
  await knex.schema.createTable('controller_leases', (t) => {
    t.integer('controller_id').unsigned().primary().references('controllers.id').onDelete('CASCADE');
    t.string('holder', 64).nullable();
    t.timestamp('expires_at', { precision: 3 }).nullable();
    t.bigInteger('fence').unsigned().notNullable().defaultTo(0);
    t.index(['holder']);
  });
  await knex.schema.createTable('job_leases', (t) => {
    t.string('name', 40).primary();
    t.string('holder', 64).nullable();
    t.timestamp('expires_at', { precision: 3 }).nullable();
    t.bigInteger('fence').unsigned().notNullable().defaultTo(0);
  });
  await knex.schema.createTable('rate_limits', (t) => {
    t.string('key', 190).primary();
    t.integer('hits').unsigned().notNullable();
    t.timestamp('reset_at', { precision: 3 }).notNullable();
    t.index(['reset_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const name of ['rate_limits', 'job_leases', 'controller_leases', 'instances']) await knex.schema.dropTable(name);
}
