import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('readings', (t) => {
    t.bigIncrements('id');
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.string('boot', 32).notNullable().defaultTo('');
    t.integer('seq').unsigned().notNullable();
    t.timestamp('ts', { precision: 3 }).notNullable();
    t.specificType('air_temp_c', 'FLOAT').notNullable();
    t.specificType('humidity_pct', 'FLOAT').nullable();
    t.boolean('moisture').nullable();
    t.specificType('forward_w', 'FLOAT').notNullable();
    t.specificType('reflected_w', 'FLOAT').notNullable();
    // derived at ingest from the calibrated coupler figures, at the antenna
    t.specificType('vswr', 'FLOAT').nullable();
    t.specificType('return_loss_db', 'FLOAT').nullable();
    t.enum('heater_mode', ['auto', 'forced-on', 'forced-off']).notNullable();
    t.boolean('heater_on').notNullable();
    t.specificType('heater_current_a', 'FLOAT').nullable();
    t.specificType('supply_volts', 'FLOAT').nullable();
    t.specificType('battery_pct', 'FLOAT').nullable();
    t.boolean('flame_proven').nullable();
    t.unique(['controller_id', 'boot', 'seq']);
    t.index(['controller_id', 'ts']);
  });
  await knex.schema.createTable('rollups_minute', (t) => {
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.timestamp('minute', { precision: 0 }).notNullable();
    t.integer('n').unsigned().notNullable();
    for (const m of ['vswr', 'forward_w', 'reflected_w', 'air_temp_c', 'humidity_pct']) {
      t.specificType(`${m}_min`, 'FLOAT').nullable();
      t.specificType(`${m}_max`, 'FLOAT').nullable();
      t.double(`${m}_sum`).notNullable().defaultTo(0);
      t.integer(`${m}_n`).unsigned().notNullable().defaultTo(0);
    }
    t.integer('heater_on_n').unsigned().notNullable().defaultTo(0);
    t.integer('moisture_n').unsigned().notNullable().defaultTo(0);
    t.primary(['controller_id', 'minute']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rollups_minute');
  await knex.schema.dropTable('readings');
}
