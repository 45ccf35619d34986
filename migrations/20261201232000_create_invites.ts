import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invites', (t) => {
    t.string('token_hash', 64).primary();
    t.integer('person_id').unsigned().notNullable().references('people.id').onDelete('CASCADE');
    t.timestamp('expires_at', { precision: 3 }).notNullable();
    t.timestamp('used_at', { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invites');
}
