import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';

import { stringify } from 'csv-stringify';
import type { Response } from 'express';
import type { Knex } from 'knex';

import { readingColumns as storedColumns } from '@/server/repositories/readings';

/**
 * CSV exports streamed from a MariaDB cursor through csv-stringify into the
 * response with stream.pipeline: backpressure all the way, so a month of
 * one-second data never sits in the server's memory, and a failure after the
 * header has gone ends the download (the socket is closed) instead of writing an
 * error page into the file. Text that a spreadsheet would run as a formula (a
 * cell starting with =, +, -, @, tab or CR) is prefixed with ' (OWASP "CSV
 * Injection"); numbers, negative ones included, stay numbers.
 */
export async function streamCsv<T>(
  res: Response,
  filename: string,
  header: string[],
  rows: AsyncIterable<T> | Iterable<T>,
  pick: (r: T) => unknown[],
) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
  async function* lines() {
    yield header;
    for await (const r of rows) yield pick(r);
  }
  const csv = stringify({ escape_formulas: true, cast: { date: (d) => d.toISOString() } });
  await pipeline(Readable.from(lines()), csv, res);
}

export function exportsService(db: Knex) {
  return {
    readings(q: { controller?: number; site?: number; from: string; to: string }) {
      const query = db('readings as r')
        .join('controllers as c', 'c.id', 'r.controller_id')
        .where('r.ts', '>=', new Date(q.from))
        .andWhere('r.ts', '<', new Date(q.to))
        .orderBy(['r.controller_id', 'r.ts'])
        .select(
          'c.serial',
          'r.boot',
          'r.seq',
          'r.ts',
          'r.received_at',
          'r.air_temp_c',
          'r.humidity_pct',
          'r.moisture',
          'r.forward_w',
          'r.reflected_w',
          'r.vswr',
          'r.return_loss_db',
          'r.heater_mode',
          'r.heater_on',
          'r.heater_current_a',
          'r.supply_volts',
          'r.battery_pct',
          'r.flame_proven',
        );
      if (q.controller) query.where('r.controller_id', q.controller);
      if (q.site) query.where('c.site_id', q.site);
      return query.stream({ highWaterMark: 1000 }) as unknown as AsyncIterable<Record<string, unknown>>;
    },
    alarms(q: { site?: number; from: string; to: string }) {
      const query = db('alarms as a')
        .join('controllers as c', 'c.id', 'a.controller_id')
        .leftJoin('people as p', 'p.id', 'a.acked_by')
        .where('a.raised_at', '>=', new Date(q.from))
        .andWhere('a.raised_at', '<', new Date(q.to))
        .orderBy('a.raised_at')
        .select(
          'a.id',
          'c.serial',
          'a.kind',
          'a.priority',
          'a.state',
          'a.raised_at',
          'a.acked_at',
          'p.name as acked_by',
          'a.ack_note',
          'a.cleared_at',
          'a.closed_at',
          'a.value',
          'a.message',
        );
      if (q.site) query.where('a.site_id', q.site);
      return query.stream() as unknown as AsyncIterable<Record<string, unknown>>;
    },
  };
}
/** The stored columns, with the controller's serial in place of its id. */
export const readingColumns = ['serial', ...storedColumns.slice(1)];
/** Column headings of the readings export: each RF figure says where it is measured. */
export const readingHeadings = readingColumns.map(
  (c) =>
    (
      ({
        forward_w: 'forward_w_at_coupler',
        reflected_w: 'reflected_w_at_coupler',
        vswr: 'vswr_at_antenna',
        return_loss_db: 'return_loss_db_at_antenna',
        ts: 'device_ts',
      }) as Record<string, string>
    )[c] ?? c,
);
export const alarmColumns = [
  'id',
  'serial',
  'kind',
  'priority',
  'state',
  'raised_at',
  'acked_at',
  'acked_by',
  'ack_note',
  'cleared_at',
  'closed_at',
  'value',
  'message',
];
