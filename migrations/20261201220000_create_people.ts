import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('people', (t) => {
    t.increments('id');
    t.string('email', 254).notNullable().unique();
    t.string('name', 120).notNullable();
    t.enum('role', ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk']).notNullable();
    t.string('password_hash', 255).notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable('sessions', (t) => {
    t.string('token_hash', 64).primary();
    t.integer('person_id').unsigned().notNullable().references('people.id').onDelete('CASCADE');
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp('expires_at', { precision: 3 }).notNullable();
    t.index(['person_id']);
  });
  await knex.schema.createTable('audit_log', (t) => {
    t.bigIncrements('id');
    t.integer('person_id').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.string('action', 64).notNullable();
    t.string('subject', 120).notNullable();
    t.json('before').nullable();
    t.json('after').nullable();
    t.timestamp('at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(['subject']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
  await knex.schema.dropTable('sessions');
  await knex.schema.dropTable('people');
}
