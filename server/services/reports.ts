import type { Knex } from 'knex';

import { notFound } from '@/server/errors';
import { alarmsRepository } from '@/server/repositories/alarms';
import type { ReadingsRepository } from '@/server/repositories/readings';
import type { Priority } from '@/telemetry/alarms/machine';
import { effectiveRule, limitSteps, type RuleChange } from '@/telemetry/alarms/rules';
import {
  type AlarmRecord,
  annunciations,
  badActors,
  benchmarks,
  floods,
  priorityDistribution,
  ratePer10Min,
  rateVerdict,
  stale,
  timeToAcknowledge,
  topContributors,
} from '@/telemetry/alarms/stats';
import { heatBudget } from '@/telemetry/math/energy';

import type { EnergyService } from './energy';

const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);

/** Storm reports, alarm-rate health and energy, from stored readings, rollups and alarms. */
export function reportsService(deps: {
  db: Knex;
  readings: ReadingsRepository;
  energy: EnergyService;
  tariffPerKwh: number;
  currency: string;
}) {
  const { db } = deps;
  const repo = alarmsRepository(db);

  async function siteControllers(siteId: number) {
    return db('controllers as c')
      .leftJoin('antennas as a', 'a.id', 'c.antenna_id')
      .where('c.site_id', siteId)
      .select('c.id', 'c.serial', 'c.kind', 'c.interval_s', 'c.antenna_id', 'a.heater_kw', 'a.name as antenna');
  }

  return {
    async storm(siteId: number, fromIso: string, toIso: string) {
      const site = await db('sites').where({ id: siteId }).first();
      if (!site) throw notFound('Site');
      const from = new Date(fromIso);
      const to = new Date(toIso);
      const rules = await repo.rules();
      const controllers = [];
      const list = await siteControllers(siteId);
      const energies = await deps.energy.windows(
        list.map((c) => c.id),
        from,
        to,
      );
      const limits = new Map(
        list.map((c) => {
          const place = { controllerId: c.id, antennaId: c.antenna_id, siteId };
          return [
            c.id,
            {
              warning: effectiveRule(rules, 'vswr-warning', place)?.params.limit ?? null,
              trip: effectiveRule(rules, 'vswr-trip', place)?.params.limit ?? null,
            },
          ];
        }),
      );
      // the rules' own history, to draw the limits as they stood at each moment of the storm
      const changes: RuleChange[] = (
        await db('audit_log')
          .whereIn('action', ['rule.create', 'rule.update', 'rule.delete'])
          .select('at', 'action', 'before', 'after')
      ).map((a) => ({
        at: new Date(a.at).getTime(),
        action: a.action,
        before: typeof a.before === 'string' ? JSON.parse(a.before) : a.before,
        after: typeof a.after === 'string' ? JSON.parse(a.after) : a.after,
      }));
      const ids = list.map((c) => c.id);
      // one query each for the figures, the peaks' times and the timelines of every controller at the site
      const limitCase = (k: 'warning' | 'trip') =>
        ids.length ? `CASE controller_id ${ids.map(() => 'WHEN ? THEN ?').join(' ')} ELSE 1e9 END` : '1e9';
      const limitArgs = (k: 'warning' | 'trip') => ids.flatMap((id) => [id, limits.get(id)![k] ?? 1e9]);
      const inWindow = () =>
        db('readings').whereIn('controller_id', ids).andWhere('ts', '>=', from).andWhere('ts', '<', to);
      const aggs = ids.length
        ? await inWindow()
            .groupBy('controller_id')
            .select(
              'controller_id',
              db.raw('COUNT(*) AS n'),
              db.raw('MAX(vswr) AS peak'),
              db.raw('SUM(heater_on) AS heater_n'),
              db.raw('MIN(battery_pct) AS battery_low'),
              db.raw(`SUM(vswr > ${limitCase('warning')}) AS above_warning`, limitArgs('warning')),
              db.raw(`SUM(vswr > ${limitCase('trip')}) AS above_trip`, limitArgs('trip')),
              db.raw('MIN(CASE WHEN moisture = 1 AND air_temp_c <= 0 THEN ts END) AS icing_start'),
              db.raw('MAX(CASE WHEN moisture = 1 AND air_temp_c <= 0 THEN ts END) AS icing_end'),
              db.raw('MIN(air_temp_c) AS temp_low'),
            )
        : [];
      const aggOf = new Map(aggs.map((a) => [a.controller_id as number, a]));
      // the first time each controller reached its peak
      // (joined in SQL: a FLOAT peak read back as a double would not compare equal to the column)
      const peakOf = inWindow().groupBy('controller_id').select('controller_id', db.raw('MAX(vswr) AS peak'));
      const peakRows = ids.length
        ? await db('readings as r')
            .join(peakOf.as('p'), function on() {
              this.on('p.controller_id', 'r.controller_id').andOn('p.peak', 'r.vswr');
            })
            .andWhere('r.ts', '>=', from)
            .andWhere('r.ts', '<', to)
            .groupBy('r.controller_id')
            .select('r.controller_id', db.raw('MIN(r.ts) AS ts'))
        : [];
      const peakAtOf = new Map(peakRows.map((p) => [p.controller_id as number, p.ts]));
      const bucketS = Math.max(60, Math.ceil((to.getTime() - from.getTime()) / 1000 / 400 / 60) * 60);
      const timelines = ids.length ? await deps.readings.rollupBuckets(ids, from, to, bucketS) : [];
      for (const c of list) {
        const energy = energies.get(c.id) ?? null;
        const { warning, trip } = limits.get(c.id)!;
        // each reading stands for one reporting interval
        const agg = aggOf.get(c.id) ?? {
          n: 0,
          peak: null,
          heater_n: 0,
          battery_low: null,
          above_warning: 0,
          above_trip: 0,
          icing_start: null,
          icing_end: null,
          temp_low: null,
        };
        const peakAt = agg.peak == null ? null : peakAtOf.get(c.id);
        const timeline = timelines.filter((p) => p.controller_id === c.id);
        const hours = (k: number) => (Number(k ?? 0) * c.interval_s) / 3600;
        controllers.push({
          id: c.id,
          serial: c.serial,
          antenna: c.antenna,
          heaterKw: c.heater_kw,
          readings: Number(agg.n),
          warning,
          trip,
          limitSteps: limitSteps(
            rules,
            changes,
            { controllerId: c.id, antennaId: c.antenna_id, siteId },
            from.getTime(),
            to.getTime(),
          ).map((x) => ({ ...x, from: new Date(x.from).toISOString() })),
          peakVswr: agg.peak == null ? null : Number(agg.peak),
          peakAt: iso(peakAt),
          hoursAboveWarning: hours(agg.above_warning),
          hoursAboveTrip: hours(agg.above_trip),
          heaterHours: hours(agg.heater_n),
          heaterKwh: energy ? energy.kwh : null,
          energy,
          batteryLowPct: agg.battery_low == null ? null : Number(agg.battery_low),
          airTempLowC: agg.temp_low == null ? null : Number(agg.temp_low),
          icingStart: iso(agg.icing_start),
          icingEnd: iso(agg.icing_end),
          timeline: timeline.map((p) => ({
            ts: iso(p.ts),
            vswrMax: p.vswr_max == null ? null : Number(p.vswr_max),
            airTempC: p.air_temp_c == null ? null : Number(p.air_temp_c),
            moisture: Boolean(Number(p.moisture)),
            heaterDuty: p.heater_duty == null ? null : Number(p.heater_duty),
          })),
        });
      }
      const alarms = await db('alarms as a')
        .leftJoin('people as p', 'p.id', 'a.acked_by')
        .join('controllers as c', 'c.id', 'a.controller_id')
        .where('a.site_id', siteId)
        .andWhere('a.raised_at', '>=', from)
        .andWhere('a.raised_at', '<', to)
        .orderBy('a.raised_at')
        .select(
          'a.id',
          'a.kind',
          'a.priority',
          'a.state',
          'a.raised_at',
          'a.acked_at',
          'a.cleared_at',
          'a.message',
          'p.name as acked_by',
          'c.serial',
        );
      const commands = await db('commands as m')
        .join('controllers as c', 'c.id', 'm.controller_id')
        .leftJoin('people as p', 'p.id', 'm.person_id')
        .where('c.site_id', siteId)
        .andWhere('m.sent_at', '>=', from)
        .andWhere('m.sent_at', '<', to)
        .orderBy('m.sent_at')
        .select(
          'm.id',
          'c.serial',
          'm.mode',
          'm.until',
          'm.reason',
          'm.sent_at',
          'm.result_ok',
          'm.result_message',
          'p.name as person',
        );
      const starts = controllers.map((c) => c.icingStart).filter(Boolean) as string[];
      const ends = controllers.map((c) => c.icingEnd).filter(Boolean) as string[];
      return {
        site: { id: site.id, name: site.name, code: site.code, timeZone: site.time_zone as string },
        from: from.toISOString(),
        to: to.toISOString(),
        icingStart: starts.sort()[0] ?? null,
        icingEnd: ends.sort().at(-1) ?? null,
        heaterKwh: controllers.reduce((a, c) => a + (c.heaterKwh ?? 0), 0),
        controllers,
        alarms: alarms.map((a) => ({
          id: a.id,
          serial: a.serial,
          kind: a.kind,
          priority: a.priority,
          state: a.state,
          message: a.message,
          raisedAt: iso(a.raised_at),
          ackedAt: iso(a.acked_at),
          ackedBy: a.acked_by,
          clearedAt: iso(a.cleared_at),
          secondsToAck: a.acked_at
            ? Math.round((new Date(a.acked_at).getTime() - new Date(a.raised_at).getTime()) / 1000)
            : null,
        })),
        commands: commands.map((m) => ({
          id: m.id,
          serial: m.serial,
          mode: m.mode,
          until: iso(m.until),
          reason: m.reason,
          sentAt: iso(m.sent_at),
          person: m.person,
          resultOk: m.result_ok == null ? null : Boolean(m.result_ok),
          resultMessage: m.result_message,
        })),
      };
    },

    async alarmHealth(fromIso: string, toIso: string) {
      const from = new Date(fromIso);
      const to = new Date(toIso);
      // every activation in the range is one alarm (annunciation), with the acknowledgement and return that followed it
      const events = await db('alarm_events as e')
        .join('alarms as a', 'a.id', 'e.alarm_id')
        .join('controllers as c', 'c.id', 'a.controller_id')
        .where('e.at', '>=', from)
        .andWhere('e.at', '<', to)
        .whereIn('e.transition', ['raised', 'reactivated', 'acknowledged', 'returned'])
        .orderBy('e.id')
        .select(
          'a.id as alarm_id',
          'a.kind',
          'a.priority',
          'e.at',
          'e.transition',
          'c.id as controller_id',
          'c.serial',
        );
      const records: AlarmRecord[] = annunciations(
        events.map((e) => ({
          alarmId: e.alarm_id as number,
          source: `${e.kind}|${e.serial}|${e.controller_id}`,
          priority: e.priority as Priority,
          atMs: new Date(e.at).getTime(),
          transition: e.transition as string,
        })),
      );
      const actors = badActors(records);
      const bins = ratePer10Min(records, from.getTime(), to.getTime());
      const average = bins.reduce((a, b) => a + b, 0) / bins.length;
      const split = (s: string) => {
        const [kind, serial, id] = s.split('|');
        return { kind, serial, controllerId: Number(id) };
      };
      return {
        from: from.toISOString(),
        to: to.toISOString(),
        total: records.length,
        benchmarks,
        averagePer10Min: average,
        maxPer10Min: bins.reduce((m, b) => (b > m ? b : m), 0),
        verdict: rateVerdict(average),
        share10MinOverAcceptable: bins.filter((b) => b > benchmarks.acceptablePer10Min).length / bins.length,
        floods: floods(bins, from.getTime()).map((f) => ({
          start: new Date(f.startMs).toISOString(),
          end: new Date(f.endMs).toISOString(),
          count: f.count,
        })),
        chattering: actors.chattering.map((o) => ({
          ...split(o.source),
          activations: o.activations,
          mostInOneMinute: o.mostInOneMinute,
        })),
        fleeting: actors.fleeting.map((o) => ({
          ...split(o.source),
          activations: o.activations,
          fleeting: o.fleeting,
        })),
        stale: stale(records, Date.now()).map((r) => ({
          ...split(r.source),
          raisedAt: new Date(r.raisedMs).toISOString(),
        })),
        top: topContributors(records, 10).map((t) => ({ ...split(t.source), count: t.count, share: t.share })),
        priorities: priorityDistribution(records),
        timeToAck: timeToAcknowledge(records),
      };
    },

    async energy(fromIso: string, toIso: string) {
      const from = new Date(fromIso);
      const to = new Date(toIso);
      // per heater and site-local day (sensor-only controllers have no heater and no duty), then per site: energy adds up, duty is the highest
      const perHeater = await deps.energy.daily(from, to);
      const zoneOf = new Map(perHeater.map((h) => [h.siteId, h.timeZone]));
      const daily = siteDays(
        perHeater.map((h) => ({
          siteId: h.siteId,
          site: h.site,
          day: h.day,
          heaterHours: h.energy.onHours,
          kwh: h.energy.kwh,
          reportedHours: h.energy.coveredHours,
          measuredKwh: h.energy.measuredKwh,
          estimatedKwh: h.energy.estimatedKwh,
          gapHours: h.energy.gapHours,
        })),
      )
        .sort((a, b) => a.siteId - b.siteId || a.day.localeCompare(b.day))
        .map((d) => ({ ...d, timeZone: zoneOf.get(d.siteId)! }));
      const sites = await db('sites')
        .whereNot('power_source', 'utility')
        .whereNull('archived_at')
        .select('id', 'name', 'battery_kwh');
      const siteIds = sites.map((s) => s.id as number);
      // the latest battery reading and the heater load of every off-grid site, one query each
      const newest = db('readings as r')
        .join('controllers as c', 'c.id', 'r.controller_id')
        .whereIn('c.site_id', siteIds)
        .whereNotNull('r.battery_pct')
        .groupBy('c.site_id')
        .select('c.site_id', db.raw('MAX(r.ts) AS ts'));
      const batteries = siteIds.length
        ? await db('readings as r')
            .join('controllers as c', 'c.id', 'r.controller_id')
            .join(newest.as('m'), function on() {
              this.on('m.site_id', 'c.site_id').andOn('m.ts', 'r.ts');
            })
            .whereNotNull('r.battery_pct')
            .select('c.site_id', 'r.battery_pct', 'r.ts')
        : [];
      const batteryOf = new Map(batteries.map((b) => [b.site_id as number, b]));
      const loads = siteIds.length
        ? await db('antennas')
            .whereIn('site_id', siteIds)
            .whereNull('archived_at')
            .groupBy('site_id')
            .select('site_id', db.raw('SUM(heater_kw) AS kw'))
        : [];
      const kwOf = new Map(loads.map((l) => [l.site_id as number, Number(l.kw ?? 0)]));
      const offGrid = sites.map((s) => {
        const last = batteryOf.get(s.id);
        const kw = kwOf.get(s.id) ?? 0;
        const b =
          last && s.battery_kwh
            ? heatBudget(
                {
                  batteryKwh: s.battery_kwh,
                  depthOfDischarge: 0.6,
                  stateOfCharge: Number(last.battery_pct) / 100,
                  baseLoadW: 200,
                  pvArrayW: 0,
                  peakSunHours: 0,
                  derating: 1,
                },
                kw * 1000,
                24,
              )
            : null;
        return {
          siteId: s.id,
          name: s.name,
          batteryKwh: s.battery_kwh,
          heaterKw: kw,
          batteryPct: last ? Number(last.battery_pct) : null,
          at: iso(last?.ts),
          hoursOfHeating: b ? (Number.isFinite(b.hoursOfHeating) ? b.hoursOfHeating : null) : null,
          assumptions: '60 % allowed depth of discharge, 200 W other load, no sun',
        };
      });
      return {
        from: from.toISOString(),
        to: to.toISOString(),
        tariffPerKwh: deps.tariffPerKwh,
        currency: deps.currency,
        daily: daily.map((d) => ({ ...d, cost: d.kwh * deps.tariffPerKwh })),
        offGrid,
      };
    },
  };
}
export type ReportsService = ReturnType<typeof reportsService>;

type HeaterDay = {
  siteId: number;
  site: string;
  day: string;
  heaterHours: number;
  kwh: number;
  reportedHours: number;
  measuredKwh?: number;
  estimatedKwh?: number;
  gapHours?: number;
};

/**
 * A site's day from its heaters' days: energy is the sum, heater hours and duty are
 * those of the longest-running heater (two heaters running side by side for an hour
 * are an hour of heating, not two), labelled as such on screen.
 */
export function siteDays(heaters: HeaterDay[]) {
  const out = new Map<
    string,
    {
      siteId: number;
      site: string;
      day: string;
      kwh: number;
      measuredKwh: number;
      estimatedKwh: number;
      gapHours: number;
      heaterHours: number;
      duty: number | null;
      heaters: number;
    }
  >();
  for (const h of heaters) {
    const key = `${h.siteId}|${h.day}`;
    const d = out.get(key) ?? {
      siteId: h.siteId,
      site: h.site,
      day: h.day,
      kwh: 0,
      measuredKwh: 0,
      estimatedKwh: 0,
      gapHours: 0,
      heaterHours: 0,
      duty: null,
      heaters: 0,
    };
    d.kwh += h.kwh;
    d.measuredKwh += h.measuredKwh ?? 0;
    d.estimatedKwh += h.estimatedKwh ?? 0;
    d.gapHours = Math.max(d.gapHours, h.gapHours ?? 0);
    d.heaterHours = Math.max(d.heaterHours, h.heaterHours);
    if (h.reportedHours > 0) d.duty = Math.max(d.duty ?? 0, h.heaterHours / h.reportedHours);
    d.heaters++;
    out.set(key, d);
  }
  return [...out.values()];
}
