import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { testApp } from '@/test/helpers/app';

type T = Awaited<ReturnType<typeof testApp>>;
let t: T;
beforeAll(async () => {
  t = await testApp();
});
afterAll(async () => {
  await t?.close();
});

const site = {
  code: 'nwt1',
  name: 'Norvik Test Ridge',
  region: 'Test Fells',
  latitude: 61.9,
  longitude: -149.1,
  elevationM: 640,
  towerHeightM: 120,
  powerSource: 'solar',
  batteryKwh: 30,
  pvKwp: 5,
  timeZone: 'America/Anchorage',
};
const fieldsOf = (res: { body: { error?: { details?: { path: string; message: string }[] } } }) =>
  (res.body.error?.details ?? []).map((d) => d.path);
const audits = (subject: string) => t.db('audit_log').where({ subject }).orderBy('id').pluck('action');

describe('sites and antennas, managed', () => {
  it('an engineer creates a site (201); a technician may not (403); the code is upper case and unique', async () => {
    expect((await t.request().post('/api/sites').set(t.as('technician')).send(site)).status).toBe(403);
    expect((await t.request().post('/api/sites').set(t.as('operator')).send(site)).status).toBe(403);
    const res = await t.request().post('/api/sites').set(t.as('engineer')).send(site);
    expect(res.status).toBe(201);
    expect(res.body.site).toMatchObject({
      code: 'NWT1',
      timeZone: 'America/Anchorage',
      pvKwp: 5,
      archivedAt: null,
      antennas: [],
    });
    expect(await audits(`site:${res.body.site.id}`)).toEqual(['site.create']);
    const again = await t
      .request()
      .post('/api/sites')
      .set(t.as('admin'))
      .send({ ...site, code: 'NWT1' });
    expect(again.status).toBe(400);
    expect(fieldsOf(again)).toEqual(['code']);
  });

  it('names each bad field', async () => {
    const res = await t
      .request()
      .post('/api/sites')
      .set(t.as('engineer'))
      .send({ ...site, code: 'x', latitude: 95, towerHeightM: -3, powerSource: 'wind', timeZone: 'Mars/Olympus' });
    expect(res.status).toBe(400);
    expect(fieldsOf(res).sort()).toEqual(['code', 'latitude', 'powerSource', 'timeZone', 'towerHeightM']);
    expect(res.body.error.details.find((d: { path: string }) => d.path === 'timeZone').message).toMatch(/IANA/);
    const ant = await t
      .request()
      .post('/api/sites/1/antennas')
      .set(t.as('engineer'))
      .send({ name: 'Dish', service: 'microwave', protection: 'heater' });
    expect(ant.status).toBe(400);
    expect(fieldsOf(ant)).toEqual(['heaterKw']);
  });

  it('edits a site and an antenna, audited with before and after; an antenna cannot sit above the tower', async () => {
    const id = (await t.db('sites').where({ code: 'NWT1' }).first()).id;
    const patched = await t
      .request()
      .patch(`/api/sites/${id}`)
      .set(t.as('engineer'))
      .send({ towerHeightM: 150, name: 'Norvik Ridge' });
    expect(patched.status).toBe(200);
    expect(patched.body.site).toMatchObject({ towerHeightM: 150, name: 'Norvik Ridge', latitude: 61.9 });
    const row = await t
      .db('audit_log')
      .where({ subject: `site:${id}`, action: 'site.update' })
      .first();
    expect(typeof row.before === 'string' ? JSON.parse(row.before) : row.before).toEqual({
      towerHeightM: 120,
      name: 'Norvik Test Ridge',
    });
    const high = await t
      .request()
      .post(`/api/sites/${id}/antennas`)
      .set(t.as('engineer'))
      .send({ name: 'FM array', service: 'fm', protection: 'heater', heaterKw: 8, heightM: 160 });
    expect(high.status).toBe(400);
    expect(fieldsOf(high)).toEqual(['heightM']);
    const ant = await t
      .request()
      .post(`/api/sites/${id}/antennas`)
      .set(t.as('engineer'))
      .send({ name: 'FM array', service: 'fm', protection: 'heater', heaterKw: 8, heightM: 140, feedLossDb: 1.1 });
    expect(ant.status).toBe(201);
    const edit = await t
      .request()
      .patch(`/api/sites/${id}/antennas/${ant.body.antenna.id}`)
      .set(t.as('engineer'))
      .send({ heaterKw: 10 });
    expect(edit.body.antenna).toMatchObject({ heaterKw: 10, heightM: 140 });
    expect(await audits(`antenna:${ant.body.antenna.id}`)).toEqual(['antenna.create', 'antenna.update']);
    // the tower cannot be lowered below an antenna on it
    const lower = await t.request().patch(`/api/sites/${id}`).set(t.as('engineer')).send({ towerHeightM: 100 });
    expect(lower.status).toBe(400);
    expect(fieldsOf(lower)).toEqual(['towerHeightM']);
  });

  it('a site with readings is archived, not deleted, and keeps its readings', async () => {
    const kettle = await t.db('sites').where({ code: 'KTP' }).first();
    const ctl = await t.db('controllers').where({ site_id: kettle.id }).first();
    await t.db('readings').insert({
      controller_id: ctl.id,
      boot: 'b1',
      seq: 0,
      ts: new Date(),
      air_temp_c: -3,
      forward_w: 100,
      reflected_w: 1,
      vswr: 1.22,
      heater_mode: 'auto',
      heater_on: 1,
    });
    expect((await t.request().delete(`/api/sites/${kettle.id}`).set(t.as('engineer'))).status).toBe(409);
    // live controllers report from it: move or decommission them first
    const busy = await t
      .request()
      .post(`/api/sites/${kettle.id}/archive`)
      .set(t.as('engineer'))
      .send({ reason: 'tower sold' });
    expect(busy.status).toBe(409);
    expect(busy.body.error.message).toMatch(/controller/);
    await t.db('controllers').where({ site_id: kettle.id }).update({ decommissioned: true });
    const archived = await t
      .request()
      .post(`/api/sites/${kettle.id}/archive`)
      .set(t.as('engineer'))
      .send({ reason: 'tower sold' });
    expect(archived.status).toBe(200);
    expect(archived.body.site.archivedAt).not.toBeNull();
    const list = (await t.request().get('/api/sites').set(t.as('operator'))).body.sites.map(
      (s: { code: string }) => s.code,
    );
    expect(list).not.toContain('KTP');
    const all = (await t.request().get('/api/sites?archived=1').set(t.as('operator'))).body.sites.map(
      (s: { code: string }) => s.code,
    );
    expect(all).toContain('KTP');
    expect(await t.db('readings').where({ controller_id: ctl.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    expect(
      (await t.request().post(`/api/sites/${kettle.id}/restore`).set(t.as('engineer'))).body.site.archivedAt,
    ).toBeNull();
    await t.db('controllers').where({ site_id: kettle.id }).update({ decommissioned: false });
    expect(await audits(`site:${kettle.id}`)).toEqual(['site.archive', 'site.restore']);
  });

  it('a site nothing hung on can be deleted', async () => {
    const res = await t
      .request()
      .post('/api/sites')
      .set(t.as('admin'))
      .send({ ...site, code: 'TYPO', antennas: [{ name: 'Panel', service: 'tv', protection: 'radome' }] });
    expect(res.status).toBe(201);
    expect(res.body.site.antennas).toHaveLength(1);
    expect((await t.request().delete(`/api/sites/${res.body.site.id}`).set(t.as('admin'))).status).toBe(204);
    expect(await t.db('sites').where({ code: 'TYPO' }).first()).toBeUndefined();
  });

  it('renames a region on all its sites', async () => {
    const res = await t
      .request()
      .post('/api/sites/regions/rename')
      .set(t.as('engineer'))
      .send({ from: 'Test Fells', to: 'Norvik Fells' });
    expect(res.body.region).toEqual({ name: 'Norvik Fells', sites: 1 });
    const regions = (await t.request().get('/api/sites/regions').set(t.as('operator'))).body.regions.map(
      (r: { name: string }) => r.name,
    );
    expect(regions).toContain('Norvik Fells');
    expect(regions).not.toContain('Test Fells');
    // a technician sees only the regions of the sites they are on call for: the new site is not one of them
    const theirs = (await t.request().get('/api/sites/regions').set(t.as('technician'))).body.regions.map(
      (r: { name: string }) => r.name,
    );
    expect(theirs).not.toContain('Norvik Fells');
    expect(theirs).toContain('Lakelands');
  });
});

describe('moving a controller', () => {
  it('moves to another antenna; readings stay with the controller and the old placement is kept', async () => {
    const from = await t
      .db('controllers as c')
      .join('sites as s', 's.id', 'c.site_id')
      .where('s.code', 'OXS')
      .first('c.id', 'c.site_id', 'c.antenna_id');
    const to = await t.db('sites').where({ code: 'NWT1' }).first();
    const antenna = await t.db('antennas').where({ site_id: to.id }).first();
    await t.db('readings').insert({
      controller_id: from.id,
      boot: 'b1',
      seq: 0,
      ts: new Date(Date.now() - 60_000),
      air_temp_c: -3,
      forward_w: 100,
      reflected_w: 1,
      vswr: 1.22,
      heater_mode: 'auto',
      heater_on: 1,
    });
    expect(
      (
        await t
          .request()
          .post(`/api/controllers/${from.id}/move`)
          .set(t.as('operator'))
          .send({ siteId: to.id, antennaId: antenna.id })
      ).status,
    ).toBe(403);
    const wrong = await t
      .request()
      .post(`/api/controllers/${from.id}/move`)
      .set(t.as('engineer'))
      .send({ siteId: to.id, antennaId: from.antenna_id });
    expect(wrong.status).toBe(400);
    expect(fieldsOf(wrong)).toEqual(['antennaId']);
    const res = await t
      .request()
      .post(`/api/controllers/${from.id}/move`)
      .set(t.as('integrator'))
      .send({ siteId: to.id, antennaId: antenna.id, note: 'spare unit' });
    expect(res.status).toBe(200);
    expect(res.body.controller).toMatchObject({ siteId: to.id, antennaId: antenna.id });
    const placements = (await t.request().get(`/api/controllers/${from.id}/placements`).set(t.as('engineer'))).body
      .placements;
    expect(placements).toHaveLength(2);
    expect(placements[0]).toMatchObject({ siteId: to.id, to: null, movedBy: 'Suki Brandvold' });
    expect(placements[1]).toMatchObject({ siteId: from.site_id, antennaId: from.antenna_id, from: null });
    expect(placements[1].to).toBe(placements[0].from);
    const former = (await t.request().get(`/api/sites/${from.site_id}/former-controllers`).set(t.as('operator'))).body
      .controllers;
    expect(former.map((c: { id: number }) => c.id)).toEqual([from.id]);
    expect(await t.db('readings').where({ controller_id: from.id }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    expect(await audits(`controller:${from.id}`)).toContain('controller.move');
  });
});

describe('importing sites and antennas', () => {
  const header =
    'record,code,name,region,latitude,longitude,elevation_m,tower_height_m,power_source,battery_kwh,pv_kwp,time_zone,site,service,protection,heater_kw,heater_phases,height_m,feed_loss_db';
  const file = [
    header,
    'site,IMP1,Imported Crest,Import Vale,63.2,11.4,700,110,utility,,,Europe/Oslo,,,,,,,',
    'antenna,,FM main array,,,,,,,,,,IMP1,fm,heater,9,1,100,1.3',
    // an existing demo site with its tower height changed, and one of its antennas re-rated
    'site,OXS,Oxlow Summit,Northern Uplands,60.97,14.61,788,155,utility,,,Europe/Stockholm,,,,,,,',
    'antenna,,FM standby array,,,,,,,,,,OXS,fm,heater,9,,,',
  ];

  it('gives a template', async () => {
    const res = await t.request().get('/api/imports/network/template').set(t.as('engineer'));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.text.split('\n')[0]).toBe(header);
    // the template itself imports cleanly as a dry run
    const dry = await t
      .request()
      .post('/api/imports/network')
      .set(t.as('engineer'))
      .set('Content-Type', 'text/csv')
      .send(res.text);
    expect(dry.body.counts).toMatchObject({ error: 0, create: 3 });
  });

  it('a dry run shows each row, and a bad row with its line and column; applying with an error writes nothing', async () => {
    const bad = [
      ...file,
      'antenna,,Ghost dish,,,,,,,,,,NOPE,microwave,radome,,,,',
      'site,IMP2,Bad Lat,Import Vale,123,11,5,50,utility,,,UTC,,,,,,,',
    ].join('\n');
    const dry = await t
      .request()
      .post('/api/imports/network')
      .set(t.as('engineer'))
      .attach('file', Buffer.from(bad), 'net.csv');
    expect(dry.status).toBe(200);
    expect(dry.body.rows.map((r: { line: number; action: string }) => [r.line, r.action])).toEqual([
      [2, 'create'],
      [3, 'create'],
      [4, 'update'],
      [5, 'update'],
      [6, 'error'],
      [7, 'error'],
    ]);
    expect(dry.body.rows[2].changes).toEqual({ tower_height_m: { from: 150, to: 155 } });
    expect(dry.body.rows[4].errors).toEqual([
      { line: 6, column: 'site', message: 'No site NOPE, here or earlier in the file' },
    ]);
    expect(dry.body.rows[5].errors).toEqual([expect.objectContaining({ line: 7, column: 'latitude' })]);
    const refused = await t
      .request()
      .post('/api/imports/network?apply=1')
      .set(t.as('engineer'))
      .attach('file', Buffer.from(bad), 'net.csv');
    expect(refused.status).toBe(422);
    expect(await t.db('sites').where({ code: 'IMP1' }).first()).toBeUndefined();
    expect((await t.db('sites').where({ code: 'OXS' }).first()).tower_height_m).toBe(150);
  });

  it('applies a good file in one transaction, audited', async () => {
    const res = await t
      .request()
      .post('/api/imports/network?apply=1')
      .set(t.as('engineer'))
      .set('Content-Type', 'text/csv')
      .send(file.join('\n'));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ applied: true, counts: { create: 2, update: 2, error: 0 } });
    const imp = await t.db('sites').where({ code: 'IMP1' }).first();
    expect(imp.time_zone).toBe('Europe/Oslo');
    expect(await t.db('antennas').where({ site_id: imp.id }).pluck('name')).toEqual(['FM main array']);
    expect((await t.db('sites').where({ code: 'OXS' }).first()).tower_height_m).toBe(155);
    expect(await audits(`site:${imp.id}`)).toEqual(['site.create']);
    // the same file again changes nothing
    const again = await t
      .request()
      .post('/api/imports/network?apply=1')
      .set(t.as('engineer'))
      .set('Content-Type', 'text/csv')
      .send(file.join('\n'));
    expect(again.body.counts).toMatchObject({ unchanged: 4, create: 0, update: 0 });
  });
});

describe('the development outbox', () => {
  it('is not mounted in production', async () => {
    const { createApp } = await import('@/server/app');
    const pino = (await import('pino')).default;
    const prod = createApp({
      db: t.db,
      config: { ...t.config, NODE_ENV: 'production' },
      log: pino({ level: 'silent' }),
    });
    const supertest = (await import('supertest')).default;
    expect((await supertest(prod).get('/api/dev/outbox').set(t.as('admin'))).status).toBe(404);
    expect((await t.request().get('/api/dev/outbox').set(t.as('admin'))).status).toBe(200);
  });
});
