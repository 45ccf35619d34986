import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { hazardRadius, screeningWindMs } from '@/telemetry/math/ice-fall';
import { testApp } from '@/test/helpers/app';

/** One falling-ice hazard: the Site screen's answer and the check-in's are the same computation. */
let t: Awaited<ReturnType<typeof testApp>>;
beforeAll(async () => {
  t = await testApp();
});
afterAll(async () => {
  await t.close();
});

const row = (controllerId: number, seq: number, minutesAgo: number, airTempC: number, moisture: boolean) => ({
  controller_id: controllerId,
  boot: 'hz',
  seq,
  ts: new Date(Date.now() - minutesAgo * 60_000),
  received_at: new Date(),
  air_temp_c: airTempC,
  humidity_pct: 90,
  moisture,
  forward_w: 1000,
  reflected_w: 10,
  vswr: 1.2,
  return_loss_db: 20,
  heater_mode: 'auto',
  heater_on: false,
  heater_current_a: 0,
  supply_volts: 240,
  battery_pct: null,
  flame_proven: null,
});

describe('falling-ice hazard', () => {
  it('warming after freezing rain: the Site screen and the check-in give the same words and radius', async () => {
    const site = await t.db('sites').where({ code: 'SBF' }).first();
    const c = await t.db('controllers').where({ site_id: site.id }).first();
    // freezing and wet two hours ago, above freezing and dry now: ice may shed
    await t.db('readings').insert([row(c.id, 0, 120, -2, true), row(c.id, 1, 5, 2.5, false)]);
    const fromSite = (await t.request().get(`/api/sites/${site.id}/hazard`).set(t.as('kiosk'))).body.hazard;
    expect(fromSite).toMatchObject({
      present: true,
      shedding: true,
      icing: false,
      reason: 'The site is warming after icing: ice may shed',
    });
    // the screening radius of telemetry/math/ice-fall for this tower, nothing computed again elsewhere
    expect(fromSite.radiusM).toBeCloseTo(
      hazardRadius({ heightM: site.tower_height_m, windMs: screeningWindMs }).radiusM,
      9,
    );
    const checkIn = await t.request().post(`/api/visits/site/${site.id}`).set(t.as('technician')).send({});
    expect(checkIn.status).toBe(409);
    expect(checkIn.body.error.details.hazard).toEqual(fromSite);
  });

  it('a quiet site has no hazard', async () => {
    const site = await t.db('sites').where({ code: 'TMK' }).first();
    expect((await t.request().get(`/api/sites/${site.id}/hazard`).set(t.as('operator'))).body.hazard).toMatchObject({
      present: false,
      radiusM: null,
    });
  });
});
