import type { Knex } from 'knex';

/**
 * Sessions are of two kinds: a browser's (cookie only) and a named API token for
 * scripts (Authorization: Bearer only), which its owner lists and revokes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sessions', (t) => {
    t.enum('kind', ['browser', 'api']).notNullable().defaultTo('browser');
    t.string('name', 80).nullable();
    t.string('public_id', 24).nullable().unique();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sessions', (t) => {
    t.dropColumn('public_id');
    t.dropColumn('name');
    t.dropColumn('kind');
  });
}
