import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { type ReadingRow, readingsRepository } from '@/server/repositories/readings';
import { atAntennaFromTransmitter, rfFromPowers } from '@/telemetry/math/rf';
import { reading, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let t: TestServer;
let creds: {
  id: number;
  serial: string;
  mqtt: { url: string; username: string; password: string; topics: Record<string, string> };
};
const count = async (id: number) =>
  Number((await t.db('readings').where({ controller_id: id }).count<{ n: number }[]>({ n: '*' }))[0].n);
const connect = (over: mqtt.IClientOptions = {}) =>
  mqtt.connectAsync(creds.mqtt.url, {
    username: creds.mqtt.username,
    password: creds.mqtt.password,
    reconnectPeriod: 0,
    protocolVersion: 4,
    connectTimeout: 3000,
    ...over,
  });

beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50, countersMs: 100 } });
  const res = await t
    .request()
    .post('/api/controllers')
    .set(t.as('integrator'))
    .send({
      serial: 'TST-KTP-01',
      siteId: 1,
      antennaId: 1,
      kind: 'heater',
      intervalS: 5,
      calibration: { forwardScale: 1, reflectedScale: 1, lineLossDb: 1 },
    });
  expect(res.status).toBe(201);
  creds = res.body;
  expect(creds.mqtt.url).toBe(`mqtt://127.0.0.1:${t.broker!.port}`);
});
afterAll(async () => {
  await t?.close();
});

describe('enrolment', () => {
  it('shows the password once and keeps only a keyed hash (HMAC-SHA-256) of it', async () => {
    expect(creds.mqtt.password.length).toBeGreaterThanOrEqual(20);
    expect(creds.mqtt.topics.telemetry).toBe('thawline/v1/TST-KTP-01/telemetry');
    const row = await t.db('controllers').where({ id: creds.id }).first();
    expect(row.password_hash).toMatch(/^hmac-sha256\$[A-Za-z0-9_-]{43}$/);
    expect(row.password_hash).not.toContain(creds.mqtt.password);
    const detail = await t.request().get(`/api/controllers/${creds.id}`).set(t.as('integrator'));
    expect(detail.body.controller.status).toBe('waiting');
    expect(JSON.stringify(detail.body)).not.toContain(creds.mqtt.password);
  });

  it('refuses a duplicate serial and an antenna of another site', async () => {
    const dup = await t
      .request()
      .post('/api/controllers')
      .set(t.as('admin'))
      .send({ serial: 'TST-KTP-01', siteId: 1, kind: 'heater' });
    expect(dup.status).toBe(409);
    const wrong = await t
      .request()
      .post('/api/controllers')
      .set(t.as('admin'))
      .send({ serial: 'TST-X', siteId: 2, antennaId: 1, kind: 'heater' });
    expect(wrong.status).toBe(400);
  });
});

describe('bulk enrolment and new passwords', () => {
  it('enrols from a CSV: a dry run names each bad row by line and column, and nothing is written until every row is good', async () => {
    const bad =
      'serial,site,antenna,kind,interval_s,line_loss_db\nCSV-1,KTP,FM main array,heater,5,0.7\nCSV-2,NOPE,,heater,5,0\nCSV-3,BRC,,radome-sensor,abc,0\nTST-KTP-01,KTP,,heater,5,0\n';
    const dry = await t
      .request()
      .post('/api/imports/controllers?apply=1')
      .set(t.as('integrator'))
      .attach('file', Buffer.from(bad), { filename: 'batch.csv', contentType: 'text/csv' });
    expect(dry.status).toBe(422);
    expect(dry.body.applied).toBe(false);
    expect(dry.body.rows.map((r: { line: number; action: string }) => [r.line, r.action])).toEqual([
      [2, 'create'],
      [3, 'error'],
      [4, 'error'],
      [5, 'error'],
    ]);
    expect(dry.body.rows[1].errors).toEqual([{ line: 3, column: 'site', message: 'No site "NOPE"' }]);
    expect(dry.body.rows[2].errors[0]).toMatchObject({ line: 4, column: 'interval_s' });
    expect(dry.body.rows[3].errors[0]).toMatchObject({
      line: 5,
      column: 'serial',
      message: expect.stringMatching(/already enrolled/),
    });
    expect(await t.db('controllers').where({ serial: 'CSV-1' }).first()).toBeUndefined();
    const good =
      'serial,site,antenna,kind,interval_s,line_loss_db\nCSV-1,KTP,FM main array,heater,5,0.7\ncsv-2,BRC,,radome-sensor,30,0\n';
    const res = await t
      .request()
      .post('/api/imports/controllers?apply=1')
      .set(t.as('integrator'))
      .set('Content-Type', 'text/csv')
      .send(good);
    expect(res.status).toBe(200);
    expect(res.body.counts).toMatchObject({ create: 2, error: 0 });
    expect(res.body.credentials.map((c: { serial: string }) => c.serial)).toEqual(['CSV-1', 'CSV-2']);
    expect(res.body.credentials[0].mqtt.password.length).toBeGreaterThanOrEqual(20);
    expect((await t.db('controllers').where({ serial: 'CSV-1' }).first()).line_loss_db).toBe(0.7);
  });

  it('a new password works at once and the old one stops working', async () => {
    const c = await connect();
    const closed = new Promise<void>((r) => c.once('close', () => r()));
    const res = await t.request().post(`/api/controllers/${creds.id}/password`).set(t.as('integrator'));
    expect(res.status).toBe(200);
    await closed;
    c.end(true);
    await expect(connect()).rejects.toThrow();
    const fresh = await connect({ password: res.body.mqtt.password });
    await fresh.endAsync();
    creds.mqtt.password = res.body.mqtt.password;
  });
});

describe('broker → ingest → MariaDB', () => {
  it('stores readings with VSWR derived at the antenna after line loss, and goes online', async () => {
    const c = await connect({
      will: {
        topic: creds.mqtt.topics.status,
        payload: Buffer.from('{"v":1,"state":"offline"}'),
        qos: 1,
        retain: true,
      },
    });
    const first = [reading({ seq: 0 }), reading({ seq: 1 }), reading({ seq: 2 })];
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(first[0]), { qos: 1 });
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(first.slice(1)), { qos: 1 });
    await until(async () => (await count(creds.id)) === 3, '3 readings stored');
    const row = await t.db('readings').where({ controller_id: creds.id, seq: 0 }).first();
    const ant = atAntennaFromTransmitter(1000, 40, 1);
    const rf = rfFromPowers(ant.forwardW, ant.reflectedW);
    expect(rf.kind).toBe('ok');
    if (rf.kind === 'ok') expect(row.vswr).toBeCloseTo(rf.vswr, 4);
    // a 1 dB line hides mismatch: VSWR at the antenna is worse than the 1.5:1 the coupler shows
    expect(row.vswr).toBeGreaterThan(1.5);
    const d = await until(async () => {
      const r = await t.request().get(`/api/controllers/${creds.id}`).set(t.as('integrator'));
      return r.body.controller.status === 'online' && r.body.controller.accepted === 3 ? r.body.controller : null;
    }, 'controller online with 3 accepted');
    expect(d.firstSeenAt).not.toBeNull();
    await c.endAsync();
  });

  it('detects a sequence gap, asks for a replay, and the backfill lands without duplicates', async () => {
    const c = await connect();
    const commands: unknown[] = [];
    c.on('message', (_topic, payload) => commands.push(JSON.parse(payload.toString())));
    await c.subscribeAsync(creds.mqtt.topics.command, { qos: 1 });
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(reading({ seq: 8 })), { qos: 1 });
    const cmd = await until(
      () =>
        commands.find((x) => (x as { type: string }).type === 'replay') as
          { fromSeq: number; toSeq: number } | undefined,
      'replay request',
    );
    expect(cmd).toMatchObject({ fromSeq: 3, toSeq: 7 });
    const backfill = [3, 4, 5, 6, 7, 2].map((seq) => reading({ seq, ts: new Date(Date.now() - 1000).toISOString() }));
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(backfill), { qos: 1 });
    await until(async () => (await count(creds.id)) === 9, '9 distinct readings');
    await new Promise((r) => setTimeout(r, 200));
    expect(await count(creds.id)).toBe(9);
    expect(t.ingest.stats.duplicates).toBeGreaterThanOrEqual(1);
    // rollups agree with the rows, backfill included
    const roll = await t.db('rollups_minute').where({ controller_id: creds.id }).sum<{ n: number }[]>({ n: 'n' });
    expect(Number(roll[0].n)).toBe(9);
    await c.endAsync();
  });

  it('drops a malformed payload, counts it with its reason, and keeps ingesting', async () => {
    const c = await connect();
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(reading({ seq: 9, humidityPct: 140 })), {
      qos: 1,
    });
    await c.publishAsync(creds.mqtt.topics.telemetry, 'garbage', { qos: 1 });
    await c.publishAsync(creds.mqtt.topics.telemetry, JSON.stringify(reading({ seq: 9 })), { qos: 1 });
    await until(async () => (await count(creds.id)) === 10, 'the good reading after the bad ones');
    const d = await until(async () => {
      const r = await t.request().get(`/api/controllers/${creds.id}`).set(t.as('engineer'));
      return r.body.controller.rejected === 2 ? r.body.controller : null;
    }, 'two rejects counted');
    expect(d.lastRejects.map((r: { reason: string }) => r.reason).join(' | ')).toMatch(/humidityPct/);
    expect(d.lastRejects.map((r: { reason: string }) => r.reason)).toContain('not JSON');
    await c.endAsync();
  });

  it('lets a controller publish only under its own serial and subscribe only to its own commands', async () => {
    const c = await connect();
    // SUBACK 0x80: refused, the connection stays
    await expect(c.subscribeAsync('thawline/v1/OTHER/command')).rejects.toMatchObject({ packet: { granted: [128] } });
    await expect(c.subscribeAsync(creds.mqtt.topics.command)).resolves.toBeTruthy();
    const closed = new Promise<void>((r) => c.once('close', () => r()));
    c.publish('thawline/v1/OTHER/telemetry', JSON.stringify(reading({ seq: 50 })), { qos: 0 });
    await closed;
    expect(await t.db('readings').where({ seq: 50 }).first()).toBeUndefined();
    c.end(true);
  });

  it('refuses a wrong password, and a decommissioned controller at once', async () => {
    await expect(connect({ password: 'not-the-password' })).rejects.toThrow();
    const c = await connect();
    const closed = new Promise<void>((r) => c.once('close', () => r()));
    const res = await t.request().post(`/api/controllers/${creds.id}/decommission`).set(t.as('integrator'));
    expect(res.body.controller.status).toBe('decommissioned');
    await closed;
    c.end(true);
    await expect(connect()).rejects.toThrow();
  });

  it('holds readings while the database refuses writes, and writes them when it is back', async () => {
    const res = await t
      .request()
      .post('/api/controllers')
      .set(t.as('admin'))
      .send({ serial: 'TST-OUTAGE', siteId: 2, kind: 'radome-sensor', intervalS: 5 });
    const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: res.body.serial,
      password: res.body.mqtt.password,
      reconnectPeriod: 0,
    });
    // seen once before the outage, as a working controller would be
    await c.publishAsync(res.body.mqtt.topics.telemetry, JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await until(async () => (await count(res.body.id)) === 1, 'first reading');
    await t.db.raw('RENAME TABLE readings TO readings_away');
    try {
      for (let i = 1; i < 6; i++)
        await c.publishAsync(res.body.mqtt.topics.telemetry, JSON.stringify(reading({ seq: i })), { qos: 1 });
      await until(() => t.ingest.stats.dbFailures > 0 && t.ingest.buffered >= 5, 'failed writes, readings buffered');
    } finally {
      await t.db.raw('RENAME TABLE readings_away TO readings');
    }
    await until(async () => (await count(res.body.id)) === 6, 'buffered readings written after the outage');
    await c.endAsync();
  });

  it('when only the rollups cannot be written, they are recomputed from the stored rows once they can', async () => {
    const res = await t
      .request()
      .post('/api/controllers')
      .set(t.as('admin'))
      .send({ serial: 'TST-ROLLUP', siteId: 2, kind: 'heater', intervalS: 1 });
    const id = res.body.id;
    const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: res.body.serial,
      password: res.body.mqtt.password,
      reconnectPeriod: 0,
    });
    const failures = t.ingest.stats.dbFailures;
    await t.db.raw('RENAME TABLE rollups_minute TO rollups_away');
    try {
      for (let i = 0; i < 4; i++)
        await c.publishAsync(
          res.body.mqtt.topics.telemetry,
          JSON.stringify(reading({ seq: i, reflectedW: 10 * (i + 1) })),
          { qos: 1 },
        );
      await until(
        async () => (await count(id)) === 4 && t.ingest.stats.dbFailures > failures,
        'rows stored, rollup write failed',
      );
    } finally {
      await t.db.raw('RENAME TABLE rollups_away TO rollups_minute');
    }
    // the next flush, whatever it carries, repairs the minute
    await c.publishAsync(res.body.mqtt.topics.telemetry, JSON.stringify(reading({ seq: 4, reflectedW: 50 })), {
      qos: 1,
    });
    await until(async () => (await count(id)) === 5, 'the fifth reading stored');
    const rows = await t.db('readings').where({ controller_id: id });
    const byMinute = new Map<number, number[]>();
    for (const r of rows) {
      const m = Math.floor(new Date(r.ts).getTime() / 60_000) * 60_000;
      byMinute.set(m, [...(byMinute.get(m) ?? []), Number(r.reflected_w)]);
    }
    await until(async () => {
      const roll = await t.db('rollups_minute').where({ controller_id: id });
      return (
        roll.length === byMinute.size &&
        roll.every((x) => {
          const w = byMinute.get(new Date(x.minute).getTime());
          return (
            w &&
            Number(x.n) === w.length &&
            Number(x.reflected_w_max) === Math.max(...w) &&
            Number(x.reflected_w_sum) === w.reduce((a, b) => a + b, 0)
          );
        })
      );
    }, 'rollups equal to what the stored rows give');
    // and the hours equal their minutes
    const [h] = await t.db('rollups_hour').where({ controller_id: id }).sum<{ n: number }[]>({ n: 'n' });
    const [hm] = await t.db('rollups_hour').where({ controller_id: id }).max<{ m: number }[]>({ m: 'reflected_w_max' });
    expect(Number(h.n)).toBe(5);
    expect(Number(hm.m)).toBe(50);
    await c.endAsync();
  });
});

describe('rollups written by two flushes at once', () => {
  it('are upserted in key order (controller, then minute), whatever order the readings came in', async () => {
    // two flushes locking the same rollup rows in opposite orders deadlocked each other under load
    const [a, b] = (await t.db('controllers').orderBy('id').limit(2).pluck('id')).map(Number);
    const at = Date.UTC(2026, 11, 1, 6, 0, 0);
    const row = (controller: number, minute: number, seq: number): ReadingRow => ({
      controller_id: controller,
      boot: 'order-check',
      seq,
      ts: new Date(at + minute * 60_000 + 5000),
      received_at: new Date(),
      air_temp_c: -3,
      humidity_pct: 90,
      moisture: true,
      forward_w: 1000,
      reflected_w: 10,
      vswr: 1.2,
      return_loss_db: 20,
      heater_mode: 'auto',
      heater_on: true,
      heater_current_a: 10,
      supply_volts: 230,
      battery_pct: null,
      flame_proven: null,
    });
    const keys: { table: string; keys: string[] }[] = [];
    const onQuery = (q: { sql: string; bindings?: unknown[] }) => {
      const m = /^insert into `(rollups_minute|rollups_hour)` \((.*?)\) values/.exec(q.sql);
      if (!m) return;
      const cols = m[2].split(', ').map((c) => c.replace(/`/g, ''));
      const id = cols.indexOf('controller_id');
      const time = cols.indexOf(m[1] === 'rollups_minute' ? 'minute' : 'hour');
      const found: string[] = [];
      for (let i = 0; i + cols.length <= (q.bindings ?? []).length; i += cols.length)
        found.push(`${q.bindings![i + id]}@${new Date(q.bindings![i + time] as Date).toISOString()}`);
      keys.push({ table: m[1], keys: found });
    };
    t.db.on('query', onQuery);
    // b's readings first, a's minutes backwards, and two hours
    await readingsRepository(t.db).addToRollups([
      row(b, 61, 0),
      row(b, 2, 1),
      row(a, 62, 0),
      row(a, 3, 1),
      row(a, 1, 2),
    ]);
    t.db.off('query', onQuery);
    const key = (id: number, minute: number) => `${id}@${new Date(at + minute * 60_000).toISOString()}`;
    expect(keys).toEqual([
      { table: 'rollups_minute', keys: [key(a, 1), key(a, 3), key(a, 62), key(b, 2), key(b, 61)] },
      { table: 'rollups_hour', keys: [key(a, 0), key(a, 60), key(b, 0), key(b, 60)] },
    ]);
  });
});

describe('history for charts', () => {
  it('never returns more points than asked, and keeps a spike through min/max buckets', async () => {
    const res = await t
      .request()
      .post('/api/controllers')
      .set(t.as('admin'))
      .send({ serial: 'TST-HIST', siteId: 3, kind: 'heater', intervalS: 1 });
    const id = res.body.id;
    const start = Date.parse('2026-11-30T00:00:00.000Z');
    const rows = Array.from({ length: 3000 }, (_, i) => ({
      controller_id: id,
      boot: '',
      seq: i,
      ts: new Date(start + i * 1000),
      received_at: new Date(start + i * 1000),
      air_temp_c: -1,
      humidity_pct: 90,
      moisture: true,
      forward_w: 1000,
      reflected_w: i === 1234 ? 250 : 10,
      vswr: i === 1234 ? 3 : 1.22,
      return_loss_db: 20,
      heater_mode: 'auto',
      heater_on: true,
      heater_current_a: 10,
      supply_volts: 240,
      battery_pct: null,
      flame_proven: null,
    }));
    await t.services.repos.readings.insertBatch(rows);
    await t.services.repos.readings.recomputeRollups(id, new Date(start), new Date(start + 3000_000));
    const q = (from: number, to: number, points: number) =>
      t
        .request()
        .get(`/api/controllers/${id}/readings`)
        .query({ from: new Date(from).toISOString(), to: new Date(to).toISOString(), points })
        .set(t.as('operator'));
    const short = await q(start, start + 100_000, 500);
    expect(short.body.source).toBe('raw');
    expect(short.body.points).toHaveLength(100);
    const bucketed = await q(start, start + 3000_000, 200);
    expect(bucketed.body.source).toBe('raw-buckets');
    expect(bucketed.body.points.length).toBeLessThanOrEqual(200);
    expect(Math.max(...bucketed.body.points.map((p: { vswrMax: number }) => p.vswrMax))).toBeCloseTo(3, 5);
    const long = await q(start - 86_400_000, start + 3000_000, 100);
    expect(long.body.source).toBe('rollups');
    expect(long.body.points.length).toBeLessThanOrEqual(100);
    expect(Math.max(...long.body.points.map((p: { vswrMax: number }) => p.vswrMax))).toBeCloseTo(3, 5);
    // a 30-day view reads the hourly rollups and still shows the 1-second spike
    const month = await q(start - 29 * 86_400_000, start + 86_400_000, 300);
    expect(month.body.source).toBe('rollups-hour');
    expect(month.body.points.length).toBeLessThanOrEqual(300);
    expect(Math.max(...month.body.points.map((p: { vswrMax: number }) => p.vswrMax))).toBeCloseTo(3, 5);
    const hours = await t.db('rollups_hour').where({ controller_id: id }).sum<{ n: number }[]>({ n: 'n' });
    expect(Number(hours[0].n)).toBe(3000);
    expect((await q(start, start + 1000, 5)).status).toBe(400);

    // twenty screens asking for the same 30-day chart at once share one query of the hourly table
    const asked: string[] = [];
    const onQuery = (x: { sql: string }) => /rollups_hour/.test(x.sql) && asked.push(x.sql);
    // history reads through its own pool
    const reads = t.services.readDb;
    reads.on('query', onQuery);
    const end = start + 2 * 86_400_000 + 1234;
    const same = await Promise.all(Array.from({ length: 20 }, (_, k) => q(start - 28 * 86_400_000 + k, end + k, 300)));
    expect(asked).toHaveLength(1);
    for (const r of same) expect(r.body).toEqual(same[0].body);
    // an answer is shared only within its window: another one is asked for
    expect((await q(start - 20 * 86_400_000, end, 300)).status).toBe(200);
    reads.off('query', onQuery);
    expect(asked).toHaveLength(2);
  });
});

describe('a controller that reboots under load', () => {
  it('asks the database for its new boot’s last stored seq once, however many readings arrive meanwhile', async () => {
    const made = await t
      .request()
      .post('/api/controllers')
      .set(t.as('integrator'))
      .send({
        serial: 'TST-KTP-09',
        siteId: 1,
        kind: 'heater',
        intervalS: 5,
        calibration: { forwardScale: 1, reflectedScale: 1, lineLossDb: 0 },
      });
    expect(made.status).toBe(201);
    const own = made.body as typeof creds;
    const c = await mqtt.connectAsync(own.mqtt.url, {
      username: own.mqtt.username,
      password: own.mqtt.password,
      reconnectPeriod: 0,
      protocolVersion: 4,
    });
    const asked: string[] = [];
    const onQuery = (q: { sql: string; bindings?: unknown[] }) => {
      if (/select max\(`seq`\)/i.test(q.sql) && q.bindings?.includes('reboot-herd')) asked.push(q.sql);
    };
    t.db.on('query', onQuery);
    const before = await count(own.id);
    const start = Math.floor(Date.now() / 1000) * 1000 - 300_000;
    const at = (i: number) => new Date(start + i * 1000 + 123).toISOString();
    // 200 messages of a boot never seen, sent without waiting for each other
    await Promise.all(
      Array.from({ length: 200 }, (_, i) =>
        c.publishAsync(own.mqtt.topics.telemetry, JSON.stringify(reading({ seq: i, boot: 'reboot-herd', ts: at(i) })), {
          qos: 1,
        }),
      ),
    );
    await until(async () => (await count(own.id)) === before + 200, 'all 200 stored');
    t.db.off('query', onQuery);
    expect(asked).toHaveLength(1);
    // and none was taken for a gap: in order, each once
    const seqs = (
      await t.db('readings').where({ controller_id: own.id, boot: 'reboot-herd' }).orderBy('seq').pluck('seq')
    ).map(Number);
    expect(seqs).toEqual(Array.from({ length: 200 }, (_, i) => i));
    // stored at the instant sent, to the millisecond (prepared statements carry times in UTC like the rest)
    const first = await t.db('readings').where({ controller_id: own.id, boot: 'reboot-herd', seq: 7 }).first();
    expect(new Date(first.ts).toISOString()).toBe(at(7));
    await c.endAsync();

    // once its controller and boot are known, a reading is taken in the turn it arrives:
    // no promise per message between the broker and the write queue (a third of ingest's time under load)
    const accepted = t.ingest.stats.accepted;
    const heard: number[] = [];
    const onReading = (r: { reading: { seq: number } }) => heard.push(r.reading.seq);
    t.ingest.on('reading', onReading);
    t.ingest.onMessage(
      own.mqtt.topics.telemetry,
      Buffer.from(JSON.stringify(reading({ seq: 200, boot: 'reboot-herd', ts: at(200) }))),
    );
    t.ingest.off('reading', onReading);
    expect(t.ingest.stats.accepted).toBe(accepted + 1);
    expect(heard).toEqual([200]);
    await until(async () => (await count(own.id)) === before + 201, 'the 201st stored');
  });
});
