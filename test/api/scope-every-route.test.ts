import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { testApp } from '@/test/helpers/app';

/**
 * A technician on call for some sites only (here: site 2, Brindle Crag) walks every
 * route that takes a site, controller, alarm, attachment or visit: things of another
 * site (12, Pellow Height) do not exist for them, lists leave them out, and writes
 * to them are refused. The same probes for site 2 succeed.
 */
let t: Awaited<ReturnType<typeof testApp>>;
const ids = {
  mine: { site: 2, controller: 0, alarm: 0 },
  other: { site: 12, controller: 0, alarm: 0, attachment: 0, visit: 0 },
};

beforeAll(async () => {
  t = await testApp();
  const tech = await t.db('people').where({ email: 'tech@demo.thawline.test' }).first();
  await t.db('site_on_call').where({ person_id: tech.id }).whereNot({ site_id: 2 }).delete();
  if (!(await t.db('site_on_call').where({ person_id: tech.id, site_id: 2 }).first()))
    await t.db('site_on_call').insert({ person_id: tech.id, site_id: 2, position: 0 });
  for (const side of ['mine', 'other'] as const) {
    const site = ids[side].site;
    const c = await t.db('controllers').where({ site_id: site }).first();
    ids[side].controller = c.id;
    const [alarm] = await t.db('alarms').insert({
      source: `vswr:${c.id}`,
      kind: 'vswr',
      controller_id: c.id,
      site_id: site,
      priority: 'high',
      state: 'unacknowledged',
      message: 'test alarm',
      machine: JSON.stringify({}),
      raised_at: new Date(),
      open_source: `vswr:${c.id}`,
    });
    ids[side].alarm = alarm;
  }
  [ids.other.attachment] = await t
    .db('attachments')
    .insert({ alarm_id: ids.other.alarm, person_id: null, file: 'none.png', mime: 'image/png', bytes: 1 });
  const admin = await t.db('people').where({ role: 'admin' }).first();
  [ids.other.visit] = await t
    .db('site_visits')
    .insert({ site_id: 12, person_id: admin.id, checked_in_at: new Date(), hazard: false });
});
afterAll(async () => {
  await t.close();
});

describe('a technician on call for site 2 only', () => {
  const get = (path: string) => t.request().get(path).set(t.as('technician'));
  const post = (path: string, body: object = {}) => t.request().post(path).set(t.as('technician')).send(body);

  it('finds nothing of another site by id', async () => {
    const o = ids.other;
    const paths = [
      `/api/sites/${o.site}`,
      `/api/sites/${o.site}/on-call`,
      `/api/controllers/${o.controller}`,
      `/api/controllers/${o.controller}/readings`,
      `/api/controllers/${o.controller}/commands`,
      `/api/rules/effective?controller=${o.controller}`,
      `/api/alarms/${o.alarm}`,
      `/api/alarms/attachments/${o.attachment}`,
      `/api/sites/${o.site}/hazard`,
    ];
    const statuses = await Promise.all(paths.map(async (p) => [p, (await get(p)).status]));
    expect(statuses.filter(([, s]) => s !== 404)).toEqual([]);
  });

  it('cannot write to another site', async () => {
    const o = ids.other;
    expect((await post(`/api/alarms/${o.alarm}/ack`, { note: 'not mine' })).status).toBe(404);
    // acknowledging several at once: one of another site refuses the whole request
    expect((await post('/api/alarms/ack', { ids: [ids.mine.alarm, o.alarm], note: 'not mine' })).status).toBe(404);
    expect((await t.db('alarms').where({ id: ids.mine.alarm }).first()).acked_at).toBeNull();
    expect(
      (await post(`/api/visits/site/${o.site}`, { checklist: { hardHat: true, plan: true, cover: true, told: true } }))
        .status,
    ).toBe(404);
    expect((await post(`/api/visits/${o.visit}/check-out`)).status).toBe(404);
    const alarm = await t.db('alarms').where({ id: o.alarm }).first();
    expect(alarm.acked_at).toBeNull();
  });

  it('sees only its own sites in every list', async () => {
    const controllers = (await get('/api/controllers')).body.controllers.map((c: { siteId: number }) => c.siteId);
    expect(controllers.length).toBeGreaterThan(0);
    expect(new Set(controllers)).toEqual(new Set([2]));
    expect((await get(`/api/controllers?site=${ids.other.site}`)).body.controllers).toEqual([]);
    const alarms = (await get('/api/alarms')).body.alarms.map((a: { siteId: number }) => a.siteId);
    expect(alarms).toContain(2);
    expect(alarms).not.toContain(12);
    expect((await get(`/api/alarms?site=${ids.other.site}`)).body.alarms).toEqual([]);
    const visits = (await get('/api/visits')).body.visits.map((v: { siteId: number }) => v.siteId);
    expect(visits).not.toContain(12);
    expect((await get(`/api/visits?site=${ids.other.site}`)).body.visits).toEqual([]);
  });

  it('reads the same things of its own site', async () => {
    const m = ids.mine;
    for (const path of [
      `/api/sites/${m.site}`,
      `/api/sites/${m.site}/on-call`,
      `/api/controllers/${m.controller}`,
      `/api/controllers/${m.controller}/readings`,
      `/api/controllers/${m.controller}/commands`,
      `/api/rules/effective?controller=${m.controller}`,
      `/api/alarms/${m.alarm}`,
      `/api/sites/${m.site}/hazard`,
    ]) {
      expect((await get(path)).status, path).toBe(200);
    }
  });

  it('while an operator still sees every site', async () => {
    expect((await t.request().get(`/api/alarms/${ids.other.alarm}`).set(t.as('operator'))).status).toBe(200);
    expect((await t.request().get(`/api/controllers/${ids.other.controller}`).set(t.as('operator'))).status).toBe(200);
  });
});
