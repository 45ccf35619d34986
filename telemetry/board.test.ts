import { describe, expect, it } from 'vitest';

import { antennaRows, type BoardController, countAlarms, orderSites, ratedCurrentA, siteCondition } from './board';

const ctl = (
  over: Partial<BoardController> & {
    vswr?: number;
    t?: number;
    wet?: boolean;
    on?: boolean;
    amps?: number;
    volts?: number;
  },
): BoardController => ({
  id: 1,
  serial: 'X-1',
  kind: 'heater',
  intervalS: 2,
  antennaId: null,
  status: 'online',
  trend: [],
  limits: { warning: 1.5, trip: 2.0 },
  latest: {
    controllerId: 1,
    siteId: 1,
    ts: '2026-12-01T00:00:00.000Z',
    vswr: over.vswr ?? 1.1,
    forwardW: 1000,
    reflectedW: 2,
    airTempC: over.t ?? 5,
    humidityPct: 80,
    moisture: over.wet ?? false,
    heaterOn: over.on ?? false,
    heaterMode: 'auto',
    heaterCurrentA: over.amps ?? 0,
    supplyVolts: over.volts ?? null,
    batteryPct: null,
  },
  ...over,
});

describe('site condition on the Board', () => {
  it('ranks a tripped VSWR above a warning, and a warning above a calm site', () => {
    const trip = siteCondition([ctl({ vswr: 2.1 })]);
    const warn = siteCondition([ctl({ vswr: 1.6 })]);
    const calm = siteCondition([ctl({})]);
    expect(trip.attention).toBeGreaterThan(warn.attention);
    expect(warn.attention).toBeGreaterThan(calm.attention);
    expect(calm.attention).toBe(0);
  });

  it('judges each controller against its own rules, so a site override changes the level', () => {
    expect(siteCondition([ctl({ vswr: 1.45 })]).vswrLevel).toBe('normal');
    expect(siteCondition([ctl({ vswr: 1.45, limits: { warning: 1.4, trip: 1.8 } })]).vswrLevel).toBe('warning');
    expect(siteCondition([ctl({ vswr: 1.9, limits: { warning: 1.4, trip: 1.8 } })]).vswrLevel).toBe('trip');
    expect(siteCondition([ctl({ vswr: 3, limits: { warning: null, trip: null } })]).vswrLevel).toBe('normal');
  });

  it('flags a heater that is off while icing is active, but not for a radome', () => {
    expect(siteCondition([ctl({ t: -2, wet: true, on: false })]).heaterOffWhileIcing).toBe(true);
    expect(siteCondition([ctl({ t: -2, wet: true, on: true })]).heaterOffWhileIcing).toBe(false);
    expect(siteCondition([ctl({ t: -2, wet: true, kind: 'radome-sensor' })]).heaterOffWhileIcing).toBe(false);
  });

  it('a silent controller makes the site silent', () => {
    expect(siteCondition([ctl({ status: 'silent' })]).silent).toBe(true);
  });
});

describe('alarm counts for the banner', () => {
  it('counts waiting alarms by priority and keeps shelved and out-of-service ones in view', () => {
    const c = countAlarms([
      { priority: 'critical', state: 'unacknowledged' },
      { priority: 'high', state: 'rtn-unacknowledged' },
      { priority: 'high', state: 'acknowledged' },
      { priority: 'medium', state: 'shelved' },
      { priority: 'low', state: 'out-of-service' },
      { priority: 'critical', state: 'unacknowledged', closedAt: '2026-12-03T00:00:00Z' },
    ]);
    expect(c).toEqual({
      waiting: { critical: 1, high: 1, medium: 0, low: 0 },
      acknowledged: 1,
      shelved: 1,
      outOfService: 1,
      suppressed: 0,
    });
  });
});

describe('order of regions and sites', () => {
  const sites = [
    { id: 1, name: 'Alder', region: 'A-region' },
    { id: 2, name: 'Birch', region: 'A-region' },
    { id: 3, name: 'Cedar', region: 'Z-region' },
    { id: 4, name: 'Dogwood', region: 'Z-region' },
  ];
  const attention = new Map([
    [1, 0],
    [2, 1],
    [3, 0],
    [4, 9],
  ]);
  it('on a phone, the region with the worst site comes first, and its worst site first', () => {
    const o = orderSites(sites, (s) => attention.get(s.id)!, 'attention');
    expect(o.map(([r, l]) => [r, l.map((s) => s.id)])).toEqual([
      ['Z-region', [4, 3]],
      ['A-region', [2, 1]],
    ]);
  });
  it('on a wall, positions do not move with attention', () => {
    const o = orderSites(sites, (s) => attention.get(s.id)!, 'stable');
    expect(o.map(([r, l]) => [r, l.map((s) => s.id)])).toEqual([
      ['A-region', [1, 2]],
      ['Z-region', [3, 4]],
    ]);
    attention.set(1, 50);
    expect(orderSites(sites, (s) => attention.get(s.id)!, 'stable')).toEqual(o);
  });
});

describe('one row per antenna on a tile', () => {
  const antennas = [
    { id: 10, name: 'FM main', heaterKw: 15, heaterPhases: 3 as const },
    { id: 11, name: 'Radome', heaterKw: null, heaterPhases: 1 as const },
  ];
  it('gives each antenna its own value, limits and trend, worst first', () => {
    const rows = antennaRows(antennas, [
      ctl({ id: 1, antennaId: 10, vswr: 1.12, trend: [{ t: 1, v: 1.1 }] }),
      ctl({ id: 2, antennaId: 11, kind: 'radome-sensor', vswr: 2.09, limits: { warning: 1.5, trip: 2.0 } }),
    ]);
    expect(rows.map((r) => [r.name, r.vswr, r.level])).toEqual([
      ['Radome', 2.09, 'trip'],
      ['FM main', 1.12, 'normal'],
    ]);
    expect(rows[1].trend).toEqual([{ t: 1, v: 1.1 }]);
  });
  it('rated current from the nameplate and the measured volts: I = P / V, or P / (√3·V) on three phases', () => {
    // 15 kW balanced three-phase on 400 V line-to-line: 15000 / (1.732 × 400) = 21.65 A (P = √3·V_LL·I_L, IEC 60050-131)
    expect(ratedCurrentA(15, 3, 400)).toBeCloseTo(21.65, 2);
    // 15 kW single-phase on 240 V: 62.5 A (P = V·I)
    expect(ratedCurrentA(15, 1, 240)).toBeCloseTo(62.5, 6);
    expect(ratedCurrentA(null, 1, 240)).toBeNull();
    expect(ratedCurrentA(15, 1, null)).toBeNull();
  });
  it('flags a heater switched on that draws under a fifth of its rated current (common practice: an open element or tripped breaker)', () => {
    const single = [{ id: 10, name: 'Heater', heaterKw: 15, heaterPhases: 1 as const }];
    const dead = antennaRows(single, [ctl({ antennaId: 10, on: true, amps: 0, volts: 240 })])[0];
    expect(dead.heater).toMatchObject({ on: true, currentA: 0, ratedA: 62.5, weak: true });
    const fine = antennaRows(single, [ctl({ antennaId: 10, on: true, amps: 61, volts: 240 })])[0];
    expect(fine.heater?.weak).toBe(false);
  });
  it('keeps controllers without an antenna on a row of their own', () => {
    const rows = antennaRows(antennas, [ctl({ id: 3, antennaId: null, vswr: 1.3 })]);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ antennaId: null, name: 'Site' });
  });
});
