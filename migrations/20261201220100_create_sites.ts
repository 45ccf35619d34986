import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sites', (t) => {
    t.increments('id');
    t.string('code', 16).notNullable().unique();
    t.string('name', 120).notNullable();
    t.string('region', 80).notNullable();
    t.double('latitude').notNullable();
    t.double('longitude').notNullable();
    t.double('elevation_m').notNullable();
    t.double('tower_height_m').notNullable();
    t.enum('power_source', ['utility', 'solar', 'generator']).notNullable();
    t.double('battery_kwh').nullable();
  });
  await knex.schema.createTable('antennas', (t) => {
    t.increments('id');
    t.integer('site_id').unsigned().notNullable().references('sites.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.enum('service', ['fm', 'tv', 'microwave', 'satellite']).notNullable();
    t.enum('protection', ['heater', 'radome', 'blanket', 'gas-heater']).notNullable();
    t.double('heater_kw').nullable();
  });
  await knex.schema.createTable('site_on_call', (t) => {
    t.integer('site_id').unsigned().notNullable().references('sites.id').onDelete('CASCADE');
    t.integer('person_id').unsigned().notNullable().references('people.id').onDelete('CASCADE');
    t.integer('position').unsigned().notNullable();
    t.primary(['site_id', 'person_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('site_on_call');
  await knex.schema.dropTable('antennas');
  await knex.schema.dropTable('sites');
}
