import { describe, expect, it } from 'vitest';

import { type BoardController, countAlarms, orderSites, siteCondition } from './board';

const ctl = (
  over: Partial<BoardController> & { vswr?: number; t?: number; wet?: boolean; on?: boolean },
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
    heaterCurrentA: 0,
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
