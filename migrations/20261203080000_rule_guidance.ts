import type { Knex } from 'knex';

/** What to do when a rule's alarm comes: written by the engineer, shown with every alarm it raises. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('alarm_rules', (t) => {
    t.text('guidance').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('alarm_rules', (t) => t.dropColumn('guidance'));
}
