import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('site_visits', (t) => {
    t.increments('id');
    t.integer('site_id').unsigned().notNullable().references('sites.id').onDelete('CASCADE');
    t.integer('person_id').unsigned().notNullable().references('people.id').onDelete('CASCADE');
    t.timestamp('checked_in_at', { precision: 3 }).notNullable();
    t.timestamp('checked_out_at', { precision: 3 }).nullable();
    t.boolean('hazard').notNullable();
    t.double('hazard_radius_m').nullable();
    t.json('checklist').nullable();
    t.string('note', 1000).nullable();
    t.index(['site_id', 'checked_in_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('site_visits');
}
