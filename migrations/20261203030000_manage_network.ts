import type { Knex } from 'knex';

/**
 * The network becomes something people manage: sites gain a time zone, a PV array
 * and an archive mark; antennas their height on the tower and feed-line loss; a
 * controller's placements are kept, so its history stays where it belonged.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('sites', (t) => {
    t.string('time_zone', 64).notNullable().defaultTo('UTC');
    t.double('pv_kwp').nullable();
    t.timestamp('archived_at', { precision: 3 }).nullable();
  });
  await knex.schema.alterTable('antennas', (t) => {
    t.double('height_m').nullable();
    t.double('feed_loss_db').nullable();
    t.timestamp('archived_at', { precision: 3 }).nullable();
  });
  await knex.schema.createTable('controller_placements', (t) => {
    t.bigIncrements('id');
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.integer('site_id').unsigned().notNullable().references('sites.id');
    t.integer('antenna_id').unsigned().nullable().references('antennas.id');
    // null: from the start, readings a controller stored before it was enrolled included
    t.timestamp('from_at', { precision: 3 }).nullable();
    t.timestamp('to_at', { precision: 3 }).nullable();
    t.integer('moved_by').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.index(['controller_id', 'from_at']);
    t.index(['site_id', 'from_at']);
  });
  // every controller has been where it is since it was enrolled
  await knex.raw(`INSERT INTO controller_placements (controller_id, site_id, antenna_id, from_at)
    SELECT id, site_id, antenna_id, NULL FROM controllers`);
  // demo people move to a domain reserved for testing (RFC 2606)
  await knex('people')
    .where('email', 'like', '%@demo.thawline')
    .update({ email: knex.raw("CONCAT(email, '.test')") });
}

export async function down(knex: Knex): Promise<void> {
  await knex('people')
    .where('email', 'like', '%@demo.thawline.test')
    .update({ email: knex.raw('LEFT(email, CHAR_LENGTH(email) - 5)') });
  await knex.schema.dropTable('controller_placements');
  await knex.schema.alterTable('antennas', (t) => {
    t.dropColumn('height_m');
    t.dropColumn('feed_loss_db');
    t.dropColumn('archived_at');
  });
  await knex.schema.alterTable('sites', (t) => {
    t.dropColumn('time_zone');
    t.dropColumn('pv_kwp');
    t.dropColumn('archived_at');
  });
}
