import { describe, expect, it } from 'vitest';

import type { BoardController } from '@/telemetry/board';

import { liveStore } from './live';

// an invented controller heard at 12:00:00, reporting every 2 s
const heard = Date.parse('2026-12-02T12:00:00Z');
const controller: BoardController = {
  id: 1,
  serial: 'KTP-1',
  kind: 'heater',
  intervalS: 2,
  antennaId: 1,
  status: 'online',
  trend: [],
  limits: { warning: 1.5, trip: 2 },
  latest: {
    controllerId: 1,
    siteId: 1,
    ts: new Date(heard).toISOString(),
    vswr: 1.2,
    forwardW: 1000,
    reflectedW: 8,
    airTempC: -2,
    humidityPct: 90,
    moisture: true,
    heaterOn: true,
    heaterMode: 'auto',
    heaterCurrentA: 10,
    supplyVolts: null,
    batteryPct: null,
  },
};

describe('live values when the browser loses its link', () => {
  it('are not marked silent: the lost link is the browser’s, not the controllers’', () => {
    liveStore.seed([{ siteId: 1, controllers: [controller] }]);
    liveStore.setConnection('open');
    liveStore.setConnection('closed');
    liveStore.sweepSilence(heard + 60_000);
    expect(liveStore.get(1)!.controllers[0].status).toBe('online');
    expect(liveStore.closedAt).not.toBeNull();
  });

  it('with the link up, a controller quiet for three intervals is marked silent', () => {
    liveStore.setConnection('open');
    liveStore.sweepSilence(heard + 60_000);
    expect(liveStore.get(1)!.controllers[0].status).toBe('silent');
  });
});

describe('per-tile updates', () => {
  it('a reading tells only its own site’s tile, in the next frame, with the newest value', async () => {
    liveStore.seed([
      {
        siteId: 21,
        controllers: [{ ...controller, id: 21, latest: { ...controller.latest!, controllerId: 21, siteId: 21 } }],
      },
      {
        siteId: 22,
        controllers: [{ ...controller, id: 22, latest: { ...controller.latest!, controllerId: 22, siteId: 22 } }],
      },
    ]);
    await new Promise((r) => setTimeout(r, 5));
    const told = { 21: 0, 22: 0 };
    const off21 = liveStore.subscribe(21, () => told[21]++);
    const off22 = liveStore.subscribe(22, () => told[22]++);
    const at = new Date(heard + 2000).toISOString();
    liveStore.apply([
      { ...controller.latest!, controllerId: 21, siteId: 21, ts: at, vswr: 1.4 },
      { ...controller.latest!, controllerId: 21, siteId: 21, ts: at, vswr: 1.6 },
    ]);
    expect(told).toEqual({ 21: 0, 22: 0 });
    await new Promise((r) => setTimeout(r, 5));
    expect(told).toEqual({ 21: 1, 22: 0 });
    expect(liveStore.get(21)!.controllers[0].latest!.vswr).toBe(1.6);
    off21();
    off22();
  });
});
