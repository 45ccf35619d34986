import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import type { ReadingRow } from '@/server/repositories/readings';
import { type TestServer, testServer } from '@/test/helpers/server';

let t: TestServer;
let ktp: { id: number; site_id: number; interval_s: number };
const start = Date.parse('2026-11-28T18:00:00.000Z');
const stepMs = 2000;
const n = 3600; // two hours at 2 s

/** An invented storm for the test: freezing rain from 18:30 to 19:10, VSWR climbing while the heater lags. */
function storm(): ReadingRow[] {
  return Array.from({ length: n }, (_, i) => {
    const minute = (i * stepMs) / 60_000;
    const wet = minute >= 30 && minute < 70;
    const vswr =
      minute < 30 ? 1.12 : minute < 60 ? 1.12 + (minute - 30) * 0.03 : Math.max(1.12, 2.02 - (minute - 60) * 0.05);
    return {
      controller_id: ktp.id,
      boot: '',
      seq: i,
      ts: new Date(start + i * stepMs),
      received_at: new Date(start + i * stepMs),
      air_temp_c: wet ? -2.5 : 1.5,
      humidity_pct: wet ? 97 : 80,
      moisture: wet,
      forward_w: 10_000,
      reflected_w: 10_000 * ((vswr - 1) / (vswr + 1)) ** 2,
      vswr,
      return_loss_db: null,
      heater_mode: 'auto',
      heater_on: minute >= 35 && minute < 95,
      heater_current_a: minute >= 35 && minute < 95 ? 50 : 0,
      supply_volts: 240,
      battery_pct: 90 - minute / 10,
      flame_proven: null,
    };
  });
}

beforeAll(async () => {
  t = await testServer();
  ktp = await t.db('controllers').where({ serial: 'KTP-1' }).first();
  const rows = storm();
  for (let i = 0; i < rows.length; i += 500) await t.services.repos.readings.insertBatch(rows.slice(i, i + 500));
  await t.services.repos.readings.recomputeRollups(ktp.id, new Date(start), new Date(start + n * stepMs));
});
afterAll(async () => {
  await t?.close();
});

const range = { site: 1, from: new Date(start).toISOString(), to: new Date(start + n * stepMs).toISOString() };

describe('storm report', () => {
  it('equals the figures worked out here from the raw rows', async () => {
    const res = await t.request().get('/api/reports/storm').query(range).set(t.as('engineer'));
    expect(res.status).toBe(200);
    const c = res.body.report.controllers.find((x: { serial: string }) => x.serial === 'KTP-1');
    const raw = (await t.db('readings').where({ controller_id: ktp.id }).orderBy('ts')) as ReadingRow[];
    const heldH = (k: number) => (k * ktp.interval_s) / 3600;
    const peak = Math.max(...raw.map((r) => r.vswr!));
    expect(c.peakVswr).toBeCloseTo(peak, 5);
    expect(Date.parse(c.peakAt)).toBe(new Date(raw.find((r) => Math.abs(r.vswr! - peak) < 1e-6)!.ts).getTime());
    expect(c.hoursAboveWarning).toBeCloseTo(heldH(raw.filter((r) => r.vswr! > 1.5).length), 6);
    expect(c.hoursAboveTrip).toBeCloseTo(heldH(raw.filter((r) => r.vswr! > 2.0).length), 6);
    // measured: 50 A at 240 V single-phase is 12 kW while on, 0 A while off; by the trapezoid rule the two
    // switching intervals count half each, so the energy is 12 kW × (readings on × 2 s) exactly
    expect(c.heaterKwh).toBeCloseTo(heldH(raw.filter((r) => r.heater_on).length) * 12, 6);
    expect(c.energy).toMatchObject({ basis: 'measured', estimatedKwh: 0, gaps: 0 });
    expect(c.batteryLowPct).toBeCloseTo(Math.min(...raw.map((r) => r.battery_pct!)), 3);
    const wet = raw.filter((r) => r.moisture && r.air_temp_c <= 0);
    expect(res.body.report.icingStart).toBe(new Date(wet[0].ts).toISOString());
    expect(res.body.report.icingEnd).toBe(new Date(wet.at(-1)!.ts).toISOString());
    expect(c.timeline.length).toBeLessThanOrEqual(400);
  });

  it('downloads as CSV, and refuses a range that ends before it starts', async () => {
    const csv = await t.request().get('/api/reports/storm.csv').query(range).set(t.as('engineer'));
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text.split('\n')[0]).toBe('section,controller,figure,value');
    expect(csv.text).toMatch(/controller,KTP-1,peak VSWR,/);
    expect(
      (
        await t
          .request()
          .get('/api/reports/storm')
          .query({ ...range, to: range.from, from: range.to })
          .set(t.as('engineer'))
      ).status,
    ).toBe(400);
  });
});

describe('energy and alarm health', () => {
  it('daily heater energy from rollups matches the raw rows', async () => {
    const res = await t
      .request()
      .get('/api/reports/energy')
      .query({ from: range.from, to: range.to })
      .set(t.as('operator'));
    const day = res.body.report.daily.find((d: { siteId: number }) => d.siteId === 1);
    const raw = await t
      .db('readings')
      .where({ controller_id: ktp.id, heater_on: true })
      .count<{ n: number }[]>({ n: '*' });
    expect(day.kwh).toBeCloseTo(((Number(raw[0].n) * 2) / 3600) * 12, 3);
    expect(day.cost).toBeCloseTo(day.kwh * 0.25, 6);
    expect(res.body.report.currency).toBe('EUR');
  });

  it('a two-heater site: energy adds up, heater hours and duty are the longest-running heater’s, not their sum', async () => {
    const sbf = await t
      .db('controllers as c')
      .join('antennas as a', 'a.id', 'c.antenna_id')
      .join('sites as s', 's.id', 'c.site_id')
      .where('s.code', 'SBF')
      .orderBy('a.heater_kw', 'desc')
      .select('c.id', 'a.heater_kw', 's.id as site_id');
    expect(sbf.map((c) => c.heater_kw)).toEqual([18, 6]);
    const day = Date.parse('2026-11-27T10:00:00.000Z');
    // one hour each: the 18 kW heater on for 54 minutes, the 6 kW one for 30 (invented; the arithmetic is kW × hours)
    const minutes = (id: number, onMinutes: number) =>
      Array.from({ length: 60 }, (_, m) => ({
        controller_id: id,
        minute: new Date(day + m * 60_000),
        n: 30,
        heater_on_n: m < onMinutes ? 30 : 0,
      }));
    await t.db('rollups_minute').insert([...minutes(sbf[0].id, 54), ...minutes(sbf[1].id, 30)]);
    // a range over 48 h: the report reads the minute rollups
    const res = await t
      .request()
      .get('/api/reports/energy')
      .query({ from: new Date(day - 2 * 86_400_000).toISOString(), to: new Date(day + 3_600_000).toISOString() })
      .set(t.as('operator'));
    const d = res.body.report.daily.find((x: { siteId: number }) => x.siteId === sbf[0].site_id);
    expect(d.kwh).toBeCloseTo(18 * 0.9 + 6 * 0.5, 9);
    expect(d.heaterHours).toBeCloseTo(0.9, 9);
    expect(d.duty).toBeCloseTo(0.9, 9);
    expect(d.heaters).toBe(2);
  });

  it('groups by the site’s own day: a site in Anchorage (UTC−9) splits at 09:00 UTC, one in Stockholm (UTC+1) at 23:00 UTC', async () => {
    // Zone offsets from the IANA time zone database: America/Anchorage is AKST, UTC−9, in December; Europe/Stockholm CET, UTC+1
    const made = await t
      .request()
      .post('/api/sites')
      .set(t.as('engineer'))
      .send({
        code: 'ANC1',
        name: 'Anchorage test site',
        region: 'Test',
        latitude: 61.2,
        longitude: -149.9,
        elevationM: 40,
        towerHeightM: 90,
        powerSource: 'utility',
        timeZone: 'America/Anchorage',
        antennas: [{ name: 'FM array', service: 'fm', protection: 'heater', heaterKw: 10 }],
      });
    expect(made.status).toBe(201);
    const enrol = await t
      .request()
      .post('/api/controllers')
      .set(t.as('integrator'))
      .send({ serial: 'ANC1-1', siteId: made.body.site.id, antennaId: made.body.site.antennas[0].id, kind: 'heater' });
    const oxs = await t
      .db('controllers as c')
      .join('sites as s', 's.id', 'c.site_id')
      .where('s.code', 'OXS')
      .first('c.id', 's.id as site_id');
    // the heater on for every minute from 2026-12-01 06:00Z to 12:00Z (6 h)
    const from = Date.parse('2026-12-01T06:00:00Z');
    const minutes = (id: number) =>
      Array.from({ length: 360 }, (_, m) => ({
        controller_id: id,
        minute: new Date(from + m * 60_000),
        n: 6,
        heater_on_n: 6,
      }));
    await t.db('rollups_minute').insert([...minutes(enrol.body.id), ...minutes(oxs.id)]);
    // three days: from the minute rollups, in quarter hours put on the site's day
    const res = await t
      .request()
      .get('/api/reports/energy')
      .query({ from: '2026-11-30T00:00:00Z', to: '2026-12-03T00:00:00Z' })
      .set(t.as('operator'));
    const days = (siteId: number) =>
      res.body.report.daily
        .filter((d: { siteId: number }) => d.siteId === siteId)
        .map((d: { day: string; heaterHours: number; timeZone: string }) => [
          d.day,
          Math.round(d.heaterHours * 100) / 100,
          d.timeZone,
        ]);
    // Anchorage: 06:00–09:00Z is 21:00–24:00 on 30 November there; 09:00–12:00Z is 00:00–03:00 on 1 December
    expect(days(made.body.site.id)).toEqual([
      ['2026-11-30', 3, 'America/Anchorage'],
      ['2026-12-01', 3, 'America/Anchorage'],
    ]);
    // Stockholm: all six hours are 07:00–13:00 on 1 December (the 8 kW standby array: 48 kWh)
    expect(days(oxs.site_id)).toEqual([['2026-12-01', 6, 'Europe/Stockholm']]);
  });

  it('finds a flood of more than 10 alarms in 10 minutes (ISA-18.2) and names the top contributor', async () => {
    const base = Date.parse('2026-11-29T03:00:00.000Z');
    const rows = Array.from({ length: 12 }, (_, i) => ({
      source: `vswr-warning:${ktp.id}`,
      kind: 'vswr-warning',
      controller_id: ktp.id,
      site_id: 1,
      priority: 'high',
      state: 'normal',
      message: 'test',
      machine: '{}',
      raised_at: new Date(base + i * 20_000),
      acked_at: new Date(base + i * 20_000 + 60_000),
      closed_at: new Date(base + i * 20_000 + 90_000),
    }));
    for (const row of rows) {
      // the engine writes each transition as an event; the report counts activations from them
      const [id] = await t.db('alarms').insert(row);
      await t.db('alarm_events').insert([
        { alarm_id: id, at: row.raised_at, transition: 'raised', state: 'unacknowledged' },
        { alarm_id: id, at: row.acked_at, transition: 'acknowledged', state: 'acknowledged' },
        { alarm_id: id, at: row.closed_at, transition: 'returned', state: 'normal' },
      ]);
    }
    const res = await t
      .request()
      .get('/api/reports/alarm-health')
      .query({ from: new Date(base).toISOString(), to: new Date(base + 3_600_000).toISOString() })
      .set(t.as('engineer'));
    const r = res.body.report;
    expect(r.total).toBe(12);
    expect(r.floods).toHaveLength(1);
    expect(r.chattering[0]).toMatchObject({
      kind: 'vswr-warning',
      serial: 'KTP-1',
      activations: 12,
      mostInOneMinute: 4,
    });
    expect(r.top[0]).toMatchObject({ kind: 'vswr-warning', count: 12, share: 1 });
    expect(r.timeToAck.medianMs).toBe(60_000);
    // 12 in an hour averages 2 per 10 minutes: the ISA-18.2 'maximum manageable' figure
    expect(r.averagePer10Min).toBeCloseTo(2, 9);
    expect(r.verdict).toBe('manageable');
  });
});

describe('exports', () => {
  it('streams readings as CSV, one line per row', async () => {
    const res = await t
      .request()
      .get('/api/reports/readings.csv')
      .query({ controller: ktp.id, from: range.from, to: range.to })
      .set(t.as('engineer'));
    const lines = res.text.trim().split('\n');
    expect(lines[0].split(',')[0]).toBe('serial');
    // every RF column says where it is measured
    expect(lines[0].split(',')).toEqual(
      expect.arrayContaining([
        'forward_w_at_coupler',
        'reflected_w_at_coupler',
        'vswr_at_antenna',
        'return_loss_db_at_antenna',
        'device_ts',
        'received_at',
      ]),
    );
    expect(lines).toHaveLength(n + 1);
    expect(
      (
        await t
          .request()
          .get('/api/reports/readings.csv')
          .query({ controller: ktp.id, from: range.from, to: range.to })
          .set(t.as('technician'))
      ).status,
    ).toBe(403);
  });
});

describe('site visits and safety', () => {
  it('during a shedding advisory, check-in cannot complete without the safety checklist', async () => {
    await t.db('alarms').insert({
      source: 'shedding-advisory:x',
      kind: 'shedding-advisory',
      controller_id: ktp.id,
      site_id: 1,
      priority: 'low',
      state: 'unacknowledged',
      message: 'warming',
      machine: '{}',
      raised_at: new Date(),
      open_source: 'shedding-advisory:x',
    });
    const refused = await t
      .request()
      .post('/api/visits/site/1')
      .set(t.as('technician'))
      .send({ checklist: { hardHat: true, plan: true } });
    expect(refused.status).toBe(409);
    expect(refused.body.error.details.missing).toEqual(['cover', 'told']);
    expect(refused.body.error.details.hazard.radiusM).toBeGreaterThan(90);
    expect(await t.db('site_visits')).toHaveLength(0);
    const ok = await t
      .request()
      .post('/api/visits/site/1')
      .set(t.as('technician'))
      .send({ checklist: { hardHat: true, plan: true, cover: true, told: true } });
    expect(ok.status).toBe(201);
    expect(ok.body.hazard.shedding).toBe(true);
    const open = await t.request().get('/api/visits').query({ open: '1' }).set(t.as('operator'));
    expect(open.body.visits[0]).toMatchObject({ person: 'Jonah Pell', site: 'Kettle Pike', hazard: true });
    expect((await t.request().post(`/api/visits/${ok.body.id}/check-out`).set(t.as('technician'))).status).toBe(204);
    expect((await t.request().get('/api/visits').query({ open: '1' }).set(t.as('operator'))).body.visits).toHaveLength(
      0,
    );
  });

  it('with no ice about, check-in needs no checklist', async () => {
    const res = await t.request().post('/api/visits/site/5').set(t.as('technician')).send({});
    expect(res.status).toBe(201);
    expect(res.body.hazard.present).toBe(false);
  });
});

describe('a moved controller', () => {
  it('its heater energy before the move stays with the site it was at', async () => {
    // TMK-1 heats on the 4.5 kW blanket at Tamsin Knoll, then moves to Marrowind Hill's 10 kW array
    const c = await t.db('controllers').where({ serial: 'TMK-1' }).first();
    const to = await t.db('sites').where({ code: 'MRW' }).first();
    const antenna = await t.db('antennas').where({ site_id: to.id }).first();
    const from = Date.parse('2026-11-20T08:00:00Z');
    await t.db('rollups_minute').insert(
      Array.from({ length: 60 }, (_, m) => ({
        controller_id: c.id,
        minute: new Date(from + m * 60_000),
        n: 6,
        heater_on_n: 6,
      })),
    );
    expect(
      (
        await t
          .request()
          .post(`/api/controllers/${c.id}/move`)
          .set(t.as('engineer'))
          .send({ siteId: to.id, antennaId: antenna.id })
      ).status,
    ).toBe(200);
    const res = await t
      .request()
      .get('/api/reports/energy')
      .query({ from: '2026-11-19T00:00:00Z', to: '2026-11-22T00:00:00Z' })
      .set(t.as('operator'));
    const bySite = res.body.report.daily.map((d: { siteId: number; kwh: number }) => [d.siteId, d.kwh]);
    // one hour at the blanket's 4.5 kW, counted at Tamsin Knoll; nothing at Marrowind Hill
    expect(bySite).toEqual([[c.site_id, 4.5]]);
  });
});

describe('one heater energy everywhere', () => {
  it('the storm report, the Energy report and the Site screen give the same kWh for the same window', async () => {
    const storm = (await t.request().get('/api/reports/storm').query(range).set(t.as('engineer'))).body.report;
    const fromStorm = storm.controllers.find((x: { serial: string }) => x.serial === 'KTP-1').heaterKwh;
    const energy = (
      await t.request().get('/api/reports/energy').query({ from: range.from, to: range.to }).set(t.as('engineer'))
    ).body.report;
    const fromEnergy = energy.daily
      .filter((d: { siteId: number }) => d.siteId === 1)
      .reduce((a: number, d: { kwh: number }) => a + d.kwh, 0);
    const site = (
      await t
        .request()
        .get(`/api/controllers/${ktp.id}/energy`)
        .query({ from: range.from, to: range.to })
        .set(t.as('technician'))
    ).body.energy;
    expect(fromStorm).toBeGreaterThan(10);
    expect(fromEnergy).toBeCloseTo(fromStorm, 9);
    expect(site.kwh).toBeCloseTo(fromStorm, 9);
    expect(site.basis).toBe('measured');
  });

  it('a dead element (switched on, 0 A) reports ~0 kWh measured, not its 15 kW rating', async () => {
    // Corvid Bluff's 15 kW TV heater: on for an hour, drawing nothing (invented storm; the figure checked is 0 A × V = 0 W)
    const cvb = await t.db('controllers').where({ serial: 'CVB-1' }).first();
    const t0 = Date.parse('2026-11-25T04:00:00.000Z');
    const rows: ReadingRow[] = Array.from({ length: 1801 }, (_, i) => ({
      controller_id: cvb.id,
      boot: 'dead',
      seq: i,
      ts: new Date(t0 + i * 2000),
      received_at: new Date(t0 + i * 2000),
      air_temp_c: -3,
      humidity_pct: 97,
      moisture: true,
      forward_w: 20_000,
      reflected_w: 400,
      vswr: 1.33,
      return_loss_db: null,
      heater_mode: 'auto',
      heater_on: true,
      heater_current_a: 0,
      supply_volts: 400,
      battery_pct: null,
      flame_proven: null,
    }));
    for (let i = 0; i < rows.length; i += 500) await t.services.repos.readings.insertBatch(rows.slice(i, i + 500));
    const q = {
      site: cvb.site_id,
      from: new Date(t0).toISOString(),
      to: new Date(t0 + 3_600_000 + 2000).toISOString(),
    };
    const c = (await t.request().get('/api/reports/storm').query(q).set(t.as('engineer'))).body.report.controllers.find(
      (x: { serial: string }) => x.serial === 'CVB-1',
    );
    expect(c.heaterHours).toBeCloseTo(1, 2);
    expect(c.energy).toMatchObject({ kwh: 0, basis: 'measured' });
    const daily = (await t.request().get('/api/reports/energy').query({ from: q.from, to: q.to }).set(t.as('engineer')))
      .body.report.daily;
    expect(daily.find((d: { siteId: number }) => d.siteId === cvb.site_id)).toMatchObject({ kwh: 0, estimatedKwh: 0 });
  });
});
