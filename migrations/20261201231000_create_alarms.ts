import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('alarm_rules', (t) => {
    t.increments('id');
    t.string('kind', 40).notNullable();
    t.enum('scope', ['global', 'site', 'antenna', 'controller']).notNullable();
    t.integer('scope_id').unsigned().nullable();
    t.boolean('enabled').notNullable().defaultTo(true);
    t.enum('priority', ['critical', 'high', 'medium', 'low']).notNullable();
    t.json('params').notNullable();
    t.integer('on_delay_s').unsigned().notNullable().defaultTo(0);
    t.integer('off_delay_s').unsigned().notNullable().defaultTo(0);
    t.double('deadband').notNullable().defaultTo(0);
    t.timestamp('updated_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(['kind', 'scope', 'scope_id']);
  });
  await knex.schema.createTable('alarms', (t) => {
    t.increments('id');
    t.string('source', 80).notNullable();
    t.string('kind', 40).notNullable();
    t.integer('rule_id').unsigned().nullable().references('alarm_rules.id').onDelete('SET NULL');
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.integer('site_id').unsigned().notNullable().references('sites.id').onDelete('CASCADE');
    t.enum('priority', ['critical', 'high', 'medium', 'low']).notNullable();
    t.string('state', 24).notNullable();
    t.double('value').nullable();
    t.string('message', 300).notNullable();
    t.json('machine').notNullable();
    t.timestamp('raised_at', { precision: 3 }).notNullable();
    t.timestamp('acked_at', { precision: 3 }).nullable();
    t.integer('acked_by').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.string('ack_note', 1000).nullable();
    t.timestamp('cleared_at', { precision: 3 }).nullable();
    t.timestamp('closed_at', { precision: 3 }).nullable();
    t.timestamp('shelved_until', { precision: 3 }).nullable();
    t.string('shelve_reason', 500).nullable();
    t.integer('escalation_level').unsigned().notNullable().defaultTo(0);
    // one open alarm per source: NULL once closed, so closed rows do not collide
    t.string('open_source', 80).nullable().unique();
    t.index(['site_id', 'state']);
    t.index(['raised_at']);
  });
  await knex.schema.createTable('alarm_events', (t) => {
    t.bigIncrements('id');
    t.integer('alarm_id').unsigned().notNullable().references('alarms.id').onDelete('CASCADE');
    t.timestamp('at', { precision: 3 }).notNullable();
    t.string('transition', 24).notNullable();
    t.string('state', 24).notNullable();
    t.integer('person_id').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.string('note', 1000).nullable();
    t.index(['alarm_id']);
  });
  await knex.schema.createTable('alarm_sources', (t) => {
    t.string('source', 80).primary();
    t.json('machine').notNullable();
    t.integer('alarm_id').unsigned().nullable();
  });
  await knex.schema.createTable('attachments', (t) => {
    t.increments('id');
    t.integer('alarm_id').unsigned().notNullable().references('alarms.id').onDelete('CASCADE');
    t.integer('person_id').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.string('file', 120).notNullable();
    t.string('mime', 40).notNullable();
    t.integer('bytes').unsigned().notNullable();
    t.timestamp('at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable('outbox', (t) => {
    t.increments('id');
    t.integer('alarm_id').unsigned().nullable().references('alarms.id').onDelete('SET NULL');
    t.integer('person_id').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.string('to', 254).notNullable();
    t.string('subject', 300).notNullable();
    t.text('body').notNullable();
    t.enum('status', ['queued', 'sent', 'failed']).notNullable().defaultTo('queued');
    t.integer('attempts').unsigned().notNullable().defaultTo(0);
    t.timestamp('next_attempt_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.string('last_error', 500).nullable();
    t.timestamp('sent_at', { precision: 3 }).nullable();
    t.timestamp('created_at', { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(['status', 'next_attempt_at']);
  });
  await knex.schema.createTable('notification_prefs', (t) => {
    t.integer('person_id').unsigned().notNullable().references('people.id').onDelete('CASCADE');
    t.enum('priority', ['critical', 'high', 'medium', 'low']).notNullable();
    t.boolean('email').notNullable();
    t.primary(['person_id', 'priority']);
  });
  await knex.schema.alterTable('sites', (t) => {
    t.integer('escalation_min').unsigned().notNullable().defaultTo(15);
  });
  await knex.schema.createTable('commands', (t) => {
    t.string('id', 64).primary();
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.string('type', 16).notNullable();
    t.string('mode', 16).nullable();
    t.timestamp('until', { precision: 3 }).nullable();
    t.string('reason', 500).nullable();
    t.integer('person_id').unsigned().nullable().references('people.id').onDelete('SET NULL');
    t.timestamp('sent_at', { precision: 3 }).notNullable();
    t.boolean('result_ok').nullable();
    t.string('result_message', 500).nullable();
    t.timestamp('result_at', { precision: 3 }).nullable();
    t.index(['controller_id', 'sent_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('commands');
  await knex.schema.alterTable('sites', (t) => t.dropColumn('escalation_min'));
  for (const name of [
    'notification_prefs',
    'outbox',
    'attachments',
    'alarm_sources',
    'alarm_events',
    'alarms',
    'alarm_rules',
  ])
    await knex.schema.dropTable(name);
}
