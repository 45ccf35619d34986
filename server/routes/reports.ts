import { Router } from 'express';
import type { Knex } from 'knex';
import { z } from 'zod';

import { allow } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import { alarmColumns, exportsService, readingColumns, readingHeadings, streamCsv } from '@/server/services/exports';
import type { ReportsService } from '@/server/services/reports';
import type { VisitsService } from '@/server/services/visits';
import {
  checkInBodySchema,
  exportQuerySchema,
  healthRangeSchema,
  idParamsSchema,
  idSchema,
  reportRangeSchema,
} from '@/telemetry/api';

export function reportsRouter(reports: ReportsService, db: Knex): Router {
  const exports = exportsService(db);
  const r = Router();
  r.get(
    '/storm',
    allow('reports.read'),
    doc('Storm report of a site over a range'),
    ...typed({ query: reportRangeSchema }, async ({ query: q, res }) => {
      res.json({ report: await reports.storm(q.site, q.from, q.to) });
    }),
  );
  r.get(
    '/storm.csv',
    allow('reports.read'),
    doc('Storm report as CSV'),
    ...typed({ query: reportRangeSchema }, async ({ query: q, res }) => {
      const rep = await reports.storm(q.site, q.from, q.to);
      const lines = [
        ['section', 'controller', 'figure', 'value'],
        ['storm', '', 'icing start', rep.icingStart ?? ''],
        ['storm', '', 'icing end', rep.icingEnd ?? ''],
        ['storm', '', 'heater kWh', rep.heaterKwh.toFixed(3)],
        ...rep.controllers.flatMap((c) => [
          ['controller', c.serial, 'peak VSWR', c.peakVswr?.toFixed(3) ?? ''],
          ['controller', c.serial, 'peak at', c.peakAt ?? ''],
          ['controller', c.serial, 'hours above warning', c.hoursAboveWarning.toFixed(3)],
          ['controller', c.serial, 'hours above trip', c.hoursAboveTrip.toFixed(3)],
          ['controller', c.serial, 'heater kWh', c.heaterKwh?.toFixed(3) ?? ''],
          ['controller', c.serial, 'battery low %', c.batteryLowPct?.toString() ?? ''],
        ]),
        ...rep.alarms.map((a) => [
          'alarm',
          a.serial,
          `${a.kind} ${a.priority} raised ${a.raisedAt}`,
          a.ackedAt ? `acknowledged by ${a.ackedBy} after ${a.secondsToAck} s` : 'not acknowledged',
        ]),
        ...rep.commands.map((m) => [
          'command',
          m.serial,
          `heater ${m.mode} by ${m.person} at ${m.sentAt}`,
          m.reason ?? '',
        ]),
      ];
      await streamCsv(res, `storm-${rep.site.code}-${q.from.slice(0, 10)}.csv`, lines[0], lines.slice(1), (row) => row);
    }),
  );
  r.get(
    '/alarm-health',
    allow('reports.read'),
    doc('Alarm-rate health (ISA-18.2 / EEMUA 191 figures) over a range'),
    ...typed({ query: healthRangeSchema }, async ({ query: q, res }) => {
      res.json({ report: await reports.alarmHealth(q.from, q.to) });
    }),
  );
  r.get(
    '/energy',
    allow('reports.read'),
    doc('Heater energy per site and site-local day, and off-grid heating budgets'),
    ...typed({ query: healthRangeSchema }, async ({ query: q, res }) => {
      res.json({ report: await reports.energy(q.from, q.to) });
    }),
  );
  r.get(
    '/readings.csv',
    allow('exports.read'),
    doc('Raw readings as CSV'),
    ...typed({ query: exportQuerySchema }, async ({ query: q, res }) => {
      await streamCsv(res, `readings-${q.from.slice(0, 10)}.csv`, readingHeadings, exports.readings(q), (row) =>
        readingColumns.map((c) => row[c]),
      );
    }),
  );
  r.get(
    '/alarms.csv',
    allow('exports.read'),
    doc('Alarms as CSV'),
    ...typed({ query: exportQuerySchema }, async ({ query: q, res }) => {
      await streamCsv(res, `alarms-${q.from.slice(0, 10)}.csv`, alarmColumns, exports.alarms(q), (row) =>
        alarmColumns.map((c) => row[c]),
      );
    }),
  );
  return r;
}

export function visitsRouter(visits: VisitsService): Router {
  const r = Router();
  const listQuery = z.object({ site: idSchema.optional(), open: z.enum(['0', '1']).optional() });
  r.get(
    '/',
    allow('visits.read'),
    doc('Site visits, open ones with open=1'),
    ...typed({ query: listQuery }, async ({ query: q, user, res }) => {
      res.json({ visits: await visits.list(user, q.site ?? null, q.open === '1') });
    }),
  );
  r.post(
    '/site/:id',
    allow('visits.write'),
    doc('Checks in at a site, with the safety checklist'),
    ...typed({ params: idParamsSchema, body: checkInBodySchema }, async ({ params, body, user, res }) => {
      res.status(201).json(await visits.checkIn(user, params.id, body));
    }),
  );
  r.post(
    '/:id/check-out',
    allow('visits.write'),
    doc('Checks out of a site visit'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      await visits.checkOut(user, params.id);
      res.status(204).end();
    }),
  );
  return r;
}
