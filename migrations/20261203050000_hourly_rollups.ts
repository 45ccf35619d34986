import type { Knex } from 'knex';

const measures = ['vswr', 'forward_w', 'reflected_w', 'air_temp_c', 'humidity_pct'];

/**
 * Hourly rollups, kept beside the minute ones and written in the same flush, so a chart
 * of weeks or months reads hundreds of rows per controller instead of tens of thousands.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('rollups_hour', (t) => {
    t.integer('controller_id').unsigned().notNullable().references('controllers.id').onDelete('CASCADE');
    t.timestamp('hour', { precision: 0 }).notNullable();
    t.integer('n').unsigned().notNullable();
    for (const m of measures) {
      t.specificType(`${m}_min`, 'FLOAT').nullable();
      t.specificType(`${m}_max`, 'FLOAT').nullable();
      t.double(`${m}_sum`).notNullable().defaultTo(0);
      t.integer(`${m}_n`).unsigned().notNullable().defaultTo(0);
    }
    t.integer('heater_on_n').unsigned().notNullable().defaultTo(0);
    t.integer('moisture_n').unsigned().notNullable().defaultTo(0);
    t.double('vi_sum').notNullable().defaultTo(0);
    t.integer('vi_n').unsigned().notNullable().defaultTo(0);
    t.primary(['controller_id', 'hour']);
  });
  // the hours of minutes already rolled up
  await knex.raw(`INSERT INTO rollups_hour (${hourColumns.join(', ')}) ${hoursFromMinutes('1 = 1')}`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rollups_hour');
}

/** The columns of an hourly rollup row, in the order `hoursFromMinutes` selects them. */
export const hourColumns = [
  'controller_id',
  'hour',
  'n',
  ...measures.flatMap((m) => [`${m}_min`, `${m}_max`, `${m}_sum`, `${m}_n`]),
  'heater_on_n',
  'moisture_n',
  'vi_sum',
  'vi_n',
];

/** A SELECT that folds minute rollups matching `where` into hour rows. */
export function hoursFromMinutes(where: string): string {
  const cols = measures.flatMap((m) => [`MIN(${m}_min)`, `MAX(${m}_max)`, `SUM(${m}_sum)`, `SUM(${m}_n)`]);
  return `SELECT controller_id, FROM_UNIXTIME(FLOOR(UNIX_TIMESTAMP(minute) / 3600) * 3600) AS hour, SUM(n),
      ${cols.join(', ')}, SUM(heater_on_n), SUM(moisture_n), SUM(vi_sum), SUM(vi_n)
    FROM rollups_minute WHERE ${where}
    GROUP BY controller_id, hour`;
}
