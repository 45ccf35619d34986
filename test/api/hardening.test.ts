import fs from 'node:fs';

import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { tinyPng } from '@/test/helpers/images';
import { demoController, reading, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

/** Uploads, exports, headers and cross-site requests, each probed as a hostile page or a careless upload would. */
let t: TestServer;
let alarmId: number;
const uploads = () => (fs.existsSync(t.config.uploadsDir) ? fs.readdirSync(t.config.uploadsDir) : []);

beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50, countersMs: 100 } });
  const rules = (await t.request().get('/api/rules').set(t.as('engineer'))).body.rules;
  const warn = rules.find((r: { kind: string; scope: string }) => r.kind === 'vswr-warning' && r.scope === 'global');
  await t
    .request()
    .put(`/api/rules/${warn.id}`)
    .set(t.as('engineer'))
    .send({ enabled: true, priority: 'high', params: warn.params, onDelayS: 0, offDelayS: 0, deadband: 0.05 });
  const d = await demoController(t, 'DNS-1');
  await d.publishAsync(
    'thawline/v1/DNS-1/telemetry',
    JSON.stringify(reading({ boot: 'h1', seq: 0, forwardW: 1000, reflectedW: 60 })),
    { qos: 1 },
  );
  const a = await until(
    async () =>
      (await t.request().get('/api/alarms').query({ open: '1' }).set(t.as('operator'))).body.alarms.find(
        (x: { kind: string; siteId: number }) => x.kind === 'vswr-warning' && x.siteId === 11,
      ),
    'alarm at Dunmere Spit',
  );
  alarmId = a.id;
  await d.endAsync();
});
afterAll(async () => {
  await t?.close();
});

describe('photo uploads', () => {
  const ack = (id: number) => t.request().post(`/api/alarms/${id}/ack`).set(t.as('technician'));

  it('a refused acknowledgement leaves no file behind', async () => {
    const before = uploads().length;
    expect((await ack(999_999).field('note', 'x').attach('photo', tinyPng(), 'a.png')).status).toBe(404);
    expect((await ack(alarmId).field('note', 'x'.repeat(1001)).attach('photo', tinyPng(), 'a.png')).status).toBe(400);
    expect(
      (
        await ack(alarmId).attach(
          'photo',
          Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.from('<html>hi</html>')]),
          { filename: 'a.jpg', contentType: 'image/jpeg' },
        )
      ).status,
    ).toBe(400);
    expect(uploads().length).toBe(before);
  });

  it('upload limits are answered 4xx, never 500', async () => {
    expect((await ack(alarmId).attach('photo', Buffer.alloc(6 * 1024 * 1024, 1), 'big.png')).status).toBe(413);
    expect((await ack(alarmId).attach('photo', tinyPng(), 'a.png').attach('photo', tinyPng(), 'b.png')).status).toBe(
      400,
    );
    expect((await ack(alarmId).attach('picture', tinyPng(), 'a.png')).status).toBe(400);
    const csv = await t
      .request()
      .post('/api/imports/controllers')
      .set(t.as('integrator'))
      .attach('file', Buffer.alloc(2 * 1024 * 1024 + 10, 0x41), 'big.csv');
    expect(csv.status).toBe(413);
    const raw = await t
      .request()
      .post('/api/imports/network')
      .set(t.as('engineer'))
      .set('Content-Type', 'text/csv')
      .send('x'.repeat(2 * 1024 * 1024 + 10));
    expect(raw.status).toBe(413);
  });

  it('a good photo is stored without its metadata, and served as an image that cannot be sniffed into a page', async () => {
    const png = tinyPng([Buffer.from('0000000f7445587453697465004b657474', 'hex')]); // a tEXt chunk cut short: damage
    expect((await ack(alarmId).attach('photo', png, 'a.png')).status).toBe(400);
    const res = await ack(alarmId).field('note', 'on my way').attach('photo', tinyPng(), 'mast.png');
    expect(res.status).toBe(200);
    const detail = (await t.request().get(`/api/alarms/${alarmId}`).set(t.as('operator'))).body.alarm;
    const photo = await t.request().get(`/api/alarms/attachments/${detail.attachments[0].id}`).set(t.as('operator'));
    expect(photo.headers['content-type']).toBe('image/png');
    expect(photo.headers['x-content-type-options']).toBe('nosniff');
    expect(photo.headers['content-disposition']).toMatch(/^inline; filename="alarm-photo-\d+\.png"$/);
    // the acknowledgement is audited like shelving
    expect(
      await t
        .db('audit_log')
        .where({ action: 'alarm.ack', subject: `alarm:${alarmId}` })
        .first(),
    ).toBeTruthy();
    // a second acknowledgement is refused and leaves no file
    const before = uploads().length;
    expect((await ack(alarmId).attach('photo', tinyPng(), 'again.png')).status).toBe(409);
    expect(uploads().length).toBe(before);
  });
});

describe('exports', () => {
  it('a note that a spreadsheet would run as a formula is written as text', async () => {
    await t.db('alarms').where({ id: alarmId }).update({ ack_note: '=HYPERLINK("http://evil.example","x")' });
    const res = await t
      .request()
      .get('/api/reports/alarms.csv')
      .query({ from: new Date(Date.now() - 3_600_000).toISOString(), to: new Date(Date.now() + 60_000).toISOString() })
      .set(t.as('engineer'));
    expect(res.status).toBe(200);
    expect(res.text).toContain(`"'=HYPERLINK(""http://evil.example"",""x"")"`);
    expect(res.text).not.toMatch(/,=HYPERLINK/);
  });
});

describe('headers and cross-site requests', () => {
  it('every answer carries the security headers', async () => {
    for (const path of ['/', '/api/health', '/api/sites']) {
      const res = await t.request().get(path).set(t.as('operator'));
      expect(res.headers['content-security-policy'], path).toMatch(/frame-ancestors 'none'/);
      expect(res.headers['content-security-policy'], path).toMatch(/script-src 'self'/);
      expect(res.headers['x-frame-options'], path).toBe('SAMEORIGIN');
      expect(res.headers['x-content-type-options'], path).toBe('nosniff');
      expect(res.headers['referrer-policy'], path).toBe('same-origin');
      expect(res.headers['strict-transport-security'], 'no HSTS over plain http').toBeUndefined();
    }
  });

  it('a state-changing request from a sibling origin is refused, even with the cookie', async () => {
    const c = await t.db('controllers').where({ serial: 'HLW-1' }).first();
    const forged = await t
      .request()
      .post(`/api/controllers/${c.id}/decommission`)
      .set(t.as('admin'))
      .set('Origin', 'http://127.0.0.1:1');
    expect(forged.status).toBe(403);
    const fetchMeta = await t
      .request()
      .post(`/api/controllers/${c.id}/password`)
      .set(t.as('admin'))
      .set('Sec-Fetch-Site', 'same-site');
    expect(fetchMeta.status).toBe(403);
    const plain = await t
      .request()
      .post(`/api/alarms/${alarmId}/shelve`)
      .set(t.as('admin'))
      .set('Content-Type', 'text/plain')
      .send('{"reason":"x"}');
    expect(plain.status).toBe(400);
    expect((await t.db('controllers').where({ id: c.id }).first()).decommissioned).toBeFalsy();
    const own = await t.request().get('/api/sites').set(t.as('admin')).set('Origin', t.url);
    expect(own.status).toBe(200);
  });
});

describe('simultaneous identical creates', () => {
  it('one is created and the others are told it exists (409), never 500', async () => {
    const enrol = await Promise.all(
      Array.from({ length: 6 }, () =>
        t.request().post('/api/controllers').set(t.as('admin')).send({ serial: 'TWIN-1', siteId: 3, kind: 'heater' }),
      ),
    );
    expect(enrol.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409]);
    const invite = await Promise.all(
      Array.from({ length: 6 }, () =>
        t
          .request()
          .post('/api/people/invite')
          .set(t.as('admin'))
          .send({ email: 'twin@demo.thawline.test', name: 'Twin', role: 'operator' }),
      ),
    );
    expect(invite.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409]);
  });
});

describe('decommissioning', () => {
  it('closes the controller’s open alarms with a history line', async () => {
    const d = await demoController(t, 'MRW-1');
    await d.publishAsync(
      'thawline/v1/MRW-1/telemetry',
      JSON.stringify(reading({ boot: 'd1', seq: 0, forwardW: 1000, reflectedW: 60 })),
      { qos: 1 },
    );
    const c = await t.db('controllers').where({ serial: 'MRW-1' }).first();
    const open = await until(
      () => t.db('alarms').where({ controller_id: c.id }).whereNull('closed_at').first(),
      'an open alarm at Marrowind Hill',
    );
    await d.endAsync();
    expect((await t.request().post(`/api/controllers/${c.id}/decommission`).set(t.as('integrator'))).status).toBe(200);
    const after = await t.db('alarms').where({ id: open.id }).first();
    expect(after.closed_at).not.toBeNull();
    expect(await t.db('alarm_events').where({ alarm_id: open.id }).pluck('transition')).toEqual(
      expect.arrayContaining(['out-of-service', 'closed']),
    );
  });
});
