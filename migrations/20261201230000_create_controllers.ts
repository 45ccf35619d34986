import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('controllers', (t) => {
    t.increments('id');
    t.string('serial', 64).notNullable().unique();
    t.integer('site_id').unsigned().notNullable().references('sites.id');
    t.integer('antenna_id').unsigned().nullable().references('antennas.id');
    t.enum('kind', ['heater', 'blanket', 'gas-heater', 'radome-sensor']).notNullable();
    t.integer('interval_s').unsigned().notNullable();
    t.double('forward_scale').notNullable().defaultTo(1);
    t.double('reflected_scale').notNullable().defaultTo(1);
    t.double('line_loss_db').notNullable().defaultTo(0);
    t.string('password_hash', 255).notNullable();
    t.boolean('decommissioned').notNullable().defaultTo(false);
    t.timestamp('first_seen_at', { precision: 3 }).nullable();
    t.timestamp('last_seen_at', { precision: 3 }).nullable();
    t.bigInteger('accepted').unsigned().notNullable().defaultTo(0);
    t.bigInteger('rejected').unsigned().notNullable().defaultTo(0);
    t.boolean('online').notNullable().defaultTo(false);
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable('controller_rejects', (t) => {
    t.bigIncrements('id');
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.timestamp('at', { precision: 3 }).notNullable();
    t.string('reason', 500).notNullable();
    t.string('payload', 2000).notNullable();
    t.index(['controller_id', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('controller_rejects');
  await knex.schema.dropTable('controllers');
}
