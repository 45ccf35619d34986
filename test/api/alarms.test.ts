import mqtt from 'mqtt';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { AlarmEngine } from '@/server/alarms/engine';
import { tinyPng } from '@/test/helpers/images';
import { demoController, reading, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let t: TestServer;
let ktp: mqtt.MqttClient;
let seq = 0;
let ktpId: number;
// 1000 W forward, 60 W reflected at the coupler is VSWR ≈ 1.65:1; through the seeded 0.5 dB line ≈ 1.8:1 at the antenna
const high = () => reading({ seq: seq++, forwardW: 1000, reflectedW: 60 });
const normal = () =>
  reading({ seq: seq++, forwardW: 1000, reflectedW: 2, airTempC: 5, moisture: false, humidityPct: 60 });
const send = (r: object) => ktp.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(r), { qos: 1 });
const openAlarms = async (kind: string) =>
  (await t.request().get('/api/alarms').query({ open: '1' }).set(t.as('operator'))).body.alarms.filter(
    (a: { kind: string; controllerId: number }) => a.kind === kind && a.controllerId === ktpId,
  );
const png = tinyPng();

beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50, countersMs: 100 } });
  ktpId = (await t.db('controllers').where({ serial: 'KTP-1' }).first()).id;
  const rules = (await t.request().get('/api/rules').set(t.as('engineer'))).body.rules;
  const warn = rules.find((r: { kind: string; scope: string }) => r.kind === 'vswr-warning' && r.scope === 'global');
  const res = await t
    .request()
    .put(`/api/rules/${warn.id}`)
    .set(t.as('engineer'))
    .send({ enabled: true, priority: 'high', params: warn.params, onDelayS: 0, offDelayS: 0, deadband: 0.05 });
  expect(res.status).toBe(200);
  ktp = await demoController(t, 'KTP-1');
});
afterAll(async () => {
  await ktp?.endAsync();
  await t?.close();
});

describe('alarm life cycle through the API', () => {
  it('a high VSWR raises an unacknowledged high-priority alarm and e-mails the first person on call', async () => {
    await send(high());
    const [a] = await until(() => openAlarms('vswr-warning').then((l) => (l.length ? l : null)), 'VSWR warning alarm');
    expect(a).toMatchObject({ priority: 'high', state: 'unacknowledged', siteId: 1 });
    expect(a.value).toBeGreaterThan(1.5);
    expect(a.message).toMatch(/^KTP-1: VSWR \d\.\d\d:1 at the antenna \(limit 1\.5:1\)$/);
    const msg = await until(
      () => t.mail.messages.find((m) => m.raw.includes(`/alarms/${a.id}`)),
      'alarm e-mail in the SMTP catcher',
    );
    expect(msg.to).toEqual(['tech@demo.thawline.test']);
    expect(msg.raw).toMatch(/Kettle Pike/);
    const row = await until(
      () => t.db('outbox').where({ alarm_id: a.id, status: 'sent' }).first(),
      'outbox row marked sent',
    );
    expect(row.attempts).toBe(1);
    // the development outbox shows the same message, decoded; its time is in the site's zone and says so, with UTC beside it
    const outbox = await t.request().get('/api/dev/outbox').set(t.as('admin'));
    const shown = outbox.body.messages.find((m: { text: string }) => m.text.includes(`/alarms/${a.id}`));
    expect(shown).toMatchObject({
      to: ['tech@demo.thawline.test'],
      subject: expect.stringMatching(/^\[HIGH\] Kettle Pike \(KTP\)/),
    });
    expect(shown.text).toMatch(
      /When: \d{4}-\d\d-\d\d \d\d:\d\d:\d\d CET at the site \(Europe\/Stockholm\), \d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/,
    );
    expect((await t.request().get('/api/dev/outbox').set(t.as('engineer'))).status).toBe(403);
  });

  it('unacknowledged past the site escalation time, it e-mails the next person on call', async () => {
    const [a] = await openAlarms('vswr-warning');
    await t.notifier.escalate(new Date(Date.now() + 16 * 60_000));
    const msg = await until(
      () =>
        t.mail.messages.find((m) => m.to.includes('engineer@demo.thawline.test') && m.raw.includes(`/alarms/${a.id}`)),
      'escalation e-mail to the second on call',
    );
    expect(msg.raw).toMatch(/Escalated/);
    expect((await t.db('alarms').where({ id: a.id }).first()).escalation_level).toBe(1);
  });

  it('a technician acknowledges with a note and a photo; the alarm stays listed until it clears', async () => {
    const [a] = await openAlarms('vswr-warning');
    const res = await t
      .request()
      .post(`/api/alarms/${a.id}/ack`)
      .set(t.as('technician'))
      .field('note', 'On my way, ice on the top bay')
      .attach('photo', png, { filename: 'mast.png', contentType: 'image/png' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.alarm.state).toBe('acknowledged');
    const detail = (await t.request().get(`/api/alarms/${a.id}`).set(t.as('operator'))).body.alarm;
    expect(detail.ackNote).toBe('On my way, ice on the top bay');
    expect(detail.events.map((e: { transition: string }) => e.transition)).toEqual(['raised', 'acknowledged']);
    const photo = await t.request().get(`/api/alarms/attachments/${detail.attachments[0].id}`).set(t.as('operator'));
    expect(photo.status).toBe(200);
    expect(photo.headers['content-type']).toMatch(/image\/png/);
    expect((await t.request().get(`/api/alarms/attachments/${detail.attachments[0].id}`)).status).toBe(401);
    await send(normal());
    await until(async () => (await openAlarms('vswr-warning')).length === 0, 'alarm closed after the VSWR falls');
    const closed = (await t.request().get(`/api/alarms/${a.id}`).set(t.as('operator'))).body.alarm;
    expect(closed.state).toBe('normal');
    expect(closed.closedAt).not.toBeNull();
  });

  it('refuses a photo that is not a JPEG or PNG, and a second acknowledgement', async () => {
    await send(high());
    const [a] = await until(() => openAlarms('vswr-warning').then((l) => (l.length ? l : null)), 'a new alarm');
    const bad = await t
      .request()
      .post(`/api/alarms/${a.id}/ack`)
      .set(t.as('technician'))
      .attach('photo', Buffer.from('GIF89a...'), { filename: 'x.png', contentType: 'image/png' });
    expect(bad.status).toBe(400);
    expect((await t.request().post(`/api/alarms/${a.id}/ack`).set(t.as('operator'))).status).toBe(200);
    expect((await t.request().post(`/api/alarms/${a.id}/ack`).set(t.as('operator'))).status).toBe(409);
  });

  it('shelves with a reason for at most 24 h; unshelving by hand returns it to acknowledged', async () => {
    const [a] = await openAlarms('vswr-warning');
    const tooLong = await t
      .request()
      .post(`/api/alarms/${a.id}/shelve`)
      .set(t.as('operator'))
      .send({ reason: 'crew on site', until: new Date(Date.now() + 25 * 3_600_000).toISOString() });
    expect(tooLong.status).toBe(400);
    const noReason = await t
      .request()
      .post(`/api/alarms/${a.id}/shelve`)
      .set(t.as('operator'))
      .send({ reason: '', until: new Date(Date.now() + 3_600_000).toISOString() });
    expect(noReason.status).toBe(400);
    const ok = await t
      .request()
      .post(`/api/alarms/${a.id}/shelve`)
      .set(t.as('operator'))
      .send({ reason: 'crew on site', until: new Date(Date.now() + 3_600_000).toISOString() });
    expect(ok.body.alarm.state).toBe('shelved');
    expect(
      (
        await t
          .request()
          .post(`/api/alarms/${a.id}/shelve`)
          .set(t.as('technician'))
          .send({ reason: 'x y z', until: new Date(Date.now() + 60_000).toISOString() })
      ).status,
    ).toBe(403);
    const un = await t.request().post(`/api/alarms/${a.id}/unshelve`).set(t.as('operator'));
    expect(un.body.alarm.state).toBe('acknowledged');
  });

  it('a restarted engine picks up the open alarm from MariaDB and raises no duplicate', async () => {
    const before = await openAlarms('vswr-warning');
    expect(before).toHaveLength(1);
    const fresh = new AlarmEngine(t.db, pino({ level: 'silent' }));
    await fresh.start(60_000);
    await fresh.onReading({
      controllerId: ktpId,
      siteId: 1,
      serial: 'KTP-1',
      reading: high() as never,
      vswr: 1.8,
      returnLossDb: 11,
      forwardW: 1000,
      reflectedW: 60,
    });
    await fresh.stop();
    const after = await openAlarms('vswr-warning');
    expect(after.map((a: { id: number }) => a.id)).toEqual(before.map((a: { id: number }) => a.id));
    expect(
      Number(
        (
          await t
            .db('alarms')
            .where({ source: `vswr-warning:${ktpId}` })
            .count<{ n: number }[]>({ n: '*' })
        )[0].n,
      ),
    ).toBe(2);
  });

  it('a silent controller raises a silent alarm on the clock', async () => {
    await t.engine.tick(Date.now() + 60_000);
    const silent = await until(() => openAlarms('silent').then((l) => (l.length ? l : null)), 'silent alarm');
    expect(silent[0].message).toMatch(/No telemetry/);
  });
});

describe('the outbox', () => {
  it('keeps a message it could not deliver, counts the attempt and backs off', async () => {
    const { outbox } = await import('@/server/mail/outbox');
    const { freePort } = await import('@/test/helpers/ports');
    const dead = outbox(t.db, pino({ level: 'silent' }), {
      host: '127.0.0.1',
      port: await freePort(),
      from: 'x@thawline.local',
    });
    await dead.enqueue({
      alarmId: null,
      personId: null,
      to: 'nobody@demo.thawline.test',
      subject: 'retry me',
      body: 'test',
    });
    const before = Date.now();
    await dead.sendDue();
    dead.stop();
    const row = await t.db('outbox').where({ subject: 'retry me' }).first();
    expect(row).toMatchObject({ status: 'queued', attempts: 1 });
    expect(row.last_error).toBeTruthy();
    expect(new Date(row.next_attempt_at).getTime()).toBeGreaterThanOrEqual(before + 14_000);
  });
});

describe('out of service', () => {
  it('an engineer takes a controller’s alarms out of service with a reason, and back', async () => {
    expect(
      (
        await t
          .request()
          .post(`/api/controllers/${ktpId}/service`)
          .set(t.as('operator'))
          .send({ outOfService: true, reason: 'mast work' })
      ).status,
    ).toBe(403);
    expect(
      (
        await t
          .request()
          .post(`/api/controllers/${ktpId}/service`)
          .set(t.as('engineer'))
          .send({ outOfService: true, reason: 'mast work' })
      ).status,
    ).toBe(204);
    expect(
      (await t.request().get(`/api/controllers/${ktpId}`).set(t.as('engineer'))).body.controller.outOfService,
    ).toBe(true);
    expect(await openAlarms('vswr-warning')).toHaveLength(0);
    // a high reading while out of service: stored, and evaluated by the engine (ingest emits before it returns), yet no alarm
    const suppressed = high();
    await send(suppressed);
    await until(
      () => t.db('readings').where({ controller_id: ktpId, seq: suppressed.seq, boot: suppressed.boot }).first(),
      'the high reading stored',
    );
    expect(await openAlarms('vswr-warning')).toHaveLength(0);
    await t
      .request()
      .post(`/api/controllers/${ktpId}/service`)
      .set(t.as('engineer'))
      .send({ outOfService: false, reason: 'work done' });
    expect(
      (await t.request().get(`/api/controllers/${ktpId}`).set(t.as('engineer'))).body.controller.outOfService,
    ).toBe(false);
    // back in service the same reading raises it: the quiet above was the suppression, not a broken pipeline
    await send(high());
    await until(() => openAlarms('vswr-warning').then((l) => (l.length ? l : null)), 'the alarm once back in service');
    await send(normal());
    expect(await t.db('audit_log').where({ action: 'controller.out-of-service' })).toHaveLength(1);
  });
});

describe('tuning rules', () => {
  it('previews how many alarms a changed threshold would have raised, then audits the change', async () => {
    const body = {
      kind: 'vswr-warning',
      controllerId: ktpId,
      days: 1,
      enabled: true,
      priority: 'high',
      params: { limit: 1.9, forwardFloorW: 1 },
      onDelayS: 0,
      offDelayS: 0,
      deadband: 0.05,
    };
    const p = await t.request().post('/api/rules/preview').set(t.as('engineer')).send(body);
    expect(p.status).toBe(200);
    expect(p.body.current).toBeGreaterThanOrEqual(2);
    expect(p.body.proposed).toBe(0);
    const o = await t
      .request()
      .post('/api/rules')
      .set(t.as('engineer'))
      .send({
        kind: 'vswr-warning',
        scope: 'site',
        scopeId: 1,
        enabled: true,
        priority: 'high',
        params: { limit: 1.9, forwardFloorW: 1 },
        onDelayS: 10,
        offDelayS: 30,
        deadband: 0.05,
      });
    expect(o.status).toBe(201);
    const eff = (await t.request().get('/api/rules/effective').query({ controller: ktpId }).set(t.as('operator'))).body
      .effective;
    expect(eff.find((e: { kind: string }) => e.kind === 'vswr-warning').rule).toMatchObject({
      scope: 'site',
      params: { limit: 1.9 },
    });
    const bad = await t
      .request()
      .put(`/api/rules/${o.body.rule.id}`)
      .set(t.as('engineer'))
      .send({
        enabled: true,
        priority: 'high',
        params: { limit: 0.5, forwardFloorW: 1 },
        onDelayS: 0,
        offDelayS: 0,
        deadband: 0,
      });
    expect(bad.status).toBe(400);
    expect(await t.db('audit_log').whereIn('action', ['rule.update', 'rule.create'])).toHaveLength(2);
  });
});

describe('heater commands', () => {
  it('forced off during icing needs confirmation, goes to the controller, records its result and raises a medium alarm', async () => {
    await send(reading({ seq: seq++, airTempC: -3, moisture: true }));
    const cmds: { id: string; type: string; mode: string }[] = [];
    ktp.on('message', (_t, p) => cmds.push(JSON.parse(p.toString())));
    await ktp.subscribeAsync('thawline/v1/KTP-1/command', { qos: 1 });
    await until(
      async () =>
        (await t.db('readings').where({ controller_id: ktpId }).orderBy('ts', 'desc').first())?.air_temp_c === -3,
      'icing reading stored',
    );
    const body = { mode: 'forced-off', untilMinutes: 60, reason: 'tower crew aloft' };
    const first = await t.request().post(`/api/controllers/${ktpId}/heater`).set(t.as('engineer')).send(body);
    expect(first.status).toBe(409);
    expect(first.body.error.details.needsConfirmation).toBe(true);
    expect(
      (
        await t
          .request()
          .post(`/api/controllers/${ktpId}/heater`)
          .set(t.as('operator'))
          .send({ ...body, confirm: true })
      ).status,
    ).toBe(403);
    const ok = await t
      .request()
      .post(`/api/controllers/${ktpId}/heater`)
      .set(t.as('engineer'))
      .send({ ...body, confirm: true });
    expect(ok.status).toBe(202);
    const cmd = await until(() => cmds.find((c) => c.type === 'heater'), 'command on the controller topic');
    expect(cmd).toMatchObject({ id: ok.body.command.id, mode: 'forced-off' });
    await ktp.publishAsync(
      'thawline/v1/KTP-1/command/result',
      JSON.stringify({ v: 1, id: cmd.id, ok: true, message: 'heater forced-off' }),
      { qos: 1 },
    );
    const row = await until(
      () => t.db('commands').where({ id: cmd.id }).whereNotNull('result_at').first(),
      'command result recorded',
    );
    expect(Boolean(row.result_ok)).toBe(true);
    const [alarm] = await until(
      () => openAlarms('heater-forced-off').then((l) => (l.length ? l : null)),
      'medium alarm for forced off during icing',
    );
    expect(alarm.priority).toBe('medium');
  });
});
