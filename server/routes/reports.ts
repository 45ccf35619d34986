import { doc } from '../http/meta';
import { Router } from 'express';
import { z } from 'zod';
import { checkInBodySchema, exportQuerySchema, healthRangeSchema, idParamsSchema, reportRangeSchema, idSchema } from '../../telemetry/api';
import { allow } from '../auth';
import { alarmColumns, exportsService, readingColumns, readingHeadings, streamCsv } from '../services/exports';
import type { ReportsService } from '../services/reports';
import type { VisitsService } from '../services/visits';
import { validate } from '../validate';
import type { Knex } from 'knex';

type Range = z.infer<typeof reportRangeSchema>;

export function reportsRouter(reports: ReportsService, db: Knex): Router {
  const exports = exportsService(db);
  const r = Router();
  r.get('/storm', allow('reports.read'), validate({ query: reportRangeSchema }), doc('Storm report of a site over a range'), async (req, res) => {
    const q = req.query as unknown as Range;
    res.json({ report: await reports.storm(q.site, q.from, q.to) });
  });
  r.get('/storm.csv', allow('reports.read'), validate({ query: reportRangeSchema }), doc('Storm report as CSV'), async (req, res) => {
    const q = req.query as unknown as Range;
    const rep = await reports.storm(q.site, q.from, q.to);
    const lines = [
      ['section', 'controller', 'figure', 'value'],
      ['storm', '', 'icing start', rep.icingStart ?? ''], ['storm', '', 'icing end', rep.icingEnd ?? ''], ['storm', '', 'heater kWh', rep.heaterKwh.toFixed(3)],
      ...rep.controllers.flatMap((c) => [
        ['controller', c.serial, 'peak VSWR', c.peakVswr?.toFixed(3) ?? ''], ['controller', c.serial, 'peak at', c.peakAt ?? ''],
        ['controller', c.serial, 'hours above warning', c.hoursAboveWarning.toFixed(3)], ['controller', c.serial, 'hours above trip', c.hoursAboveTrip.toFixed(3)],
        ['controller', c.serial, 'heater kWh', c.heaterKwh?.toFixed(3) ?? ''], ['controller', c.serial, 'battery low %', c.batteryLowPct?.toString() ?? ''],
      ]),
      ...rep.alarms.map((a) => ['alarm', a.serial, `${a.kind} ${a.priority} raised ${a.raisedAt}`, a.ackedAt ? `acknowledged by ${a.ackedBy} after ${a.secondsToAck} s` : 'not acknowledged']),
      ...rep.commands.map((m) => ['command', m.serial, `heater ${m.mode} by ${m.person} at ${m.sentAt}`, m.reason ?? '']),
    ];
    await streamCsv(res, `storm-${rep.site.code}-${q.from.slice(0, 10)}.csv`, lines[0], lines.slice(1), (row) => row);
  });
  r.get('/alarm-health', allow('reports.read'), validate({ query: healthRangeSchema }), doc('Alarm-rate health (ISA-18.2 / EEMUA 191 figures) over a range'), async (req, res) => {
    const q = req.query as unknown as { from: string; to: string };
    res.json({ report: await reports.alarmHealth(q.from, q.to) });
  });
  r.get('/energy', allow('reports.read'), validate({ query: healthRangeSchema }), doc('Heater energy per site and site-local day, and off-grid heating budgets'), async (req, res) => {
    const q = req.query as unknown as { from: string; to: string };
    res.json({ report: await reports.energy(q.from, q.to) });
  });
  r.get('/readings.csv', allow('exports.read'), validate({ query: exportQuerySchema }), doc('Raw readings as CSV'), async (req, res) => {
    const q = req.query as unknown as z.infer<typeof exportQuerySchema>;
    await streamCsv(res, `readings-${q.from.slice(0, 10)}.csv`, readingHeadings, exports.readings(q), (row) => readingColumns.map((c) => row[c]));
  });
  r.get('/alarms.csv', allow('exports.read'), validate({ query: exportQuerySchema }), doc('Alarms as CSV'), async (req, res) => {
    const q = req.query as unknown as z.infer<typeof exportQuerySchema>;
    await streamCsv(res, `alarms-${q.from.slice(0, 10)}.csv`, alarmColumns, exports.alarms(q), (row) => alarmColumns.map((c) => row[c]));
  });
  return r;
}

export function visitsRouter(visits: VisitsService): Router {
  const r = Router();
  const listQuery = z.object({ site: idSchema.optional(), open: z.enum(['0', '1']).optional() });
  r.get('/', allow('visits.read'), validate({ query: listQuery }), doc('Site visits, open ones with open=1'), async (req, res) => {
    const q = req.query as unknown as z.infer<typeof listQuery>;
    res.json({ visits: await visits.list(req.user!, q.site ?? null, q.open === '1') });
  });
  r.post('/site/:id', allow('visits.write'), validate({ params: idParamsSchema, body: checkInBodySchema }), doc('Checks in at a site, with the safety checklist'), async (req, res) => {
    res.status(201).json(await visits.checkIn(req.user!, Number(req.params.id), req.body));
  });
  r.post('/:id/check-out', allow('visits.write'), validate({ params: idParamsSchema }), doc('Checks out of a site visit'), async (req, res) => {
    await visits.checkOut(req.user!, Number(req.params.id));
    res.status(204).end();
  });
  return r;
}
