import type { Knex } from 'knex';

/**
 * Measured heater energy: minute rollups keep the sum and count of volts × amps,
 * and an antenna says whether its heater is single- or three-phase.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('rollups_minute', (t) => {
    t.double('vi_sum').notNullable().defaultTo(0);
    t.integer('vi_n').unsigned().notNullable().defaultTo(0);
  });
  await knex.schema.alterTable('antennas', (t) => {
    t.tinyint('heater_phases').unsigned().notNullable().defaultTo(1);
  });
  // minutes rolled up before: recompute their sums from the stored readings
  await knex.raw(`UPDATE rollups_minute r JOIN (
      SELECT controller_id, FROM_UNIXTIME(FLOOR(UNIX_TIMESTAMP(ts) / 60) * 60) AS minute,
             COALESCE(SUM(supply_volts * heater_current_a), 0) AS vi_sum, COUNT(supply_volts * heater_current_a) AS vi_n
      FROM readings GROUP BY controller_id, minute) x ON x.controller_id = r.controller_id AND x.minute = r.minute
    SET r.vi_sum = x.vi_sum, r.vi_n = x.vi_n`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('antennas', (t) => t.dropColumn('heater_phases'));
  await knex.schema.alterTable('rollups_minute', (t) => {
    t.dropColumn('vi_sum');
    t.dropColumn('vi_n');
  });
}
