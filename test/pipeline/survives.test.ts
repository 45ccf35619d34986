import net from 'node:net';

import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import WebSocket from 'ws';

import { demoControllerPassword } from '@/seeds/03_controllers';
import { demoController, liveSocket, reading, refusedStatus, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

/** Each request here stopped the whole server before; now it is answered and the server keeps serving. */
let t: TestServer;
beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50, countersMs: 100 }, throughProxy: true });
});
afterAll(async () => {
  await t?.close();
});

const alive = async () => (await t.request().get('/api/health')).status;

/** Sends raw bytes and returns what the server answered before closing. */
function raw(port: number, text: string): Promise<string> {
  return new Promise((resolve) => {
    const s = net.connect({ host: '127.0.0.1', port }, () => s.write(text));
    let got = '';
    s.on('data', (d) => (got += d.toString('latin1')));
    s.on('close', () => resolve(got));
    s.on('error', () => resolve(got));
    setTimeout(() => s.destroy(), 3000);
  });
}

const port = () => Number(new URL(t.url).port);

describe('hostile requests', () => {
  it('a malformed percent-escape in the cookie of a /live upgrade is refused, not thrown', async () => {
    const answer = await raw(
      port(),
      'GET /live HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: Upgrade\r\nUpgrade: websocket\r\n' +
        'Sec-WebSocket-Version: 13\r\nSec-WebSocket-Key: dGhlIHNhbXBsZSBub25jZQ==\r\nCookie: x=%E0%A4%A; thawline_session=%E0%A4%A\r\n\r\n',
    );
    expect(answer).toMatch(/^HTTP\/1.1 401/);
    expect(await alive()).toBe(200);
  });

  it('an invalid request target on an upgrade request is answered 400', async () => {
    const answer = await raw(
      port(),
      'GET http://[ HTTP/1.1\r\nHost: x\r\nConnection: Upgrade\r\nUpgrade: websocket\r\n\r\n',
    );
    expect(answer).toMatch(/^HTTP\/1.1 400/);
    expect(await alive()).toBe(200);
  });

  it('an alarm-health range from year 0 is refused at once with a clear reason', async () => {
    const started = Date.now();
    const res = await t
      .request()
      .get('/api/reports/alarm-health')
      .query({ from: '0000-01-01T00:00:00Z', to: '2026-12-01T00:00:00Z' })
      .set(t.as('engineer'));
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toContain('At most 400 days');
    expect(Date.now() - started).toBeLessThan(5000);
  });

  it('an MQTT packet announced larger than the limit is cut before it is buffered', async () => {
    // CONNECT fixed header announcing 100 MB (remaining length 0x80 0x80 0x80 0x30)
    const s = net.connect({ host: '127.0.0.1', port: t.broker!.port });
    await new Promise((r) => s.once('connect', r));
    const closed = new Promise<boolean>((resolve) => {
      s.on('close', () => resolve(true));
      setTimeout(() => resolve(false), 3000);
    });
    s.on('error', () => {});
    s.write(Buffer.from([0x10, 0x80, 0x80, 0x80, 0x30]));
    s.write(Buffer.alloc(64 * 1024, 0x41));
    expect(await closed).toBe(true);
    expect(await alive()).toBe(200);
  });

  it('/mqtt and /live refuse a page of another origin', async () => {
    const mq = new WebSocket(`${t.url.replace('http', 'ws')}/mqtt`, 'mqtt', {
      headers: { Origin: 'http://evil.example' },
    });
    expect(await refusedStatus(mq)).toBe(403);
    expect(await refusedStatus(liveSocket(t, 'operator', { Origin: 'http://evil.example' }))).toBe(403);
    expect(await refusedStatus(liveSocket(t, 'operator', { Origin: t.url }))).toBe(101);
  });
});

describe('device credentials at the broker', () => {
  const connect = (username: string, password: string) =>
    mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username,
      password,
      reconnectPeriod: 0,
      connectTimeout: 5000,
    });

  it('a case variant of a serial is another, unknown name', async () => {
    await expect(connect('ktp-1', demoControllerPassword)).rejects.toThrow();
    await expect(connect('Ktp-1', demoControllerPassword)).rejects.toThrow();
  });

  it('an old argon2 hash is replaced by the keyed hash on the first good connect', async () => {
    const before = await t.db('controllers').where({ serial: 'SBF-2' }).first();
    expect(before.password_hash).toMatch(/^\$argon2/);
    const c = await connect('SBF-2', demoControllerPassword);
    await c.endAsync();
    const after = await t.db('controllers').where({ serial: 'SBF-2' }).first();
    expect(after.password_hash).toMatch(/^hmac-sha256\$/);
    const again = await connect('SBF-2', demoControllerPassword);
    await again.endAsync();
  });

  it('failed sign-ins for one serial are throttled: after ten, even the right password waits', async () => {
    for (let i = 0; i < 10; i++) await expect(connect('HLW-1', `wrong-${i}`)).rejects.toThrow();
    await expect(connect('HLW-1', demoControllerPassword)).rejects.toThrow(/authori|Not authorized|refused/i);
  });
});

describe('readings that are never lost or corrupted', () => {
  const stored = async (serial: string) => {
    const c = await t.db('controllers').where({ serial }).first();
    return {
      c,
      rows: await t.db('readings').where({ controller_id: c.id }).orderBy(['boot', 'seq']).select('boot', 'seq', 'ts'),
    };
  };

  it('a device that restarts (new boot, seq from 0) loses none of its readings', async () => {
    const d = await demoController(t, 'OXS-1');
    const now = Date.now();
    const first = Array.from({ length: 10 }, (_, i) =>
      reading({ boot: 'boot-a', seq: i, ts: new Date(now - 60_000 + i * 1000).toISOString() }),
    );
    const second = Array.from({ length: 10 }, (_, i) =>
      reading({ boot: 'boot-b', seq: i, ts: new Date(now - 30_000 + i * 1000).toISOString() }),
    );
    await d.publishAsync('thawline/v1/OXS-1/telemetry', JSON.stringify(first), { qos: 1 });
    await d.publishAsync('thawline/v1/OXS-1/telemetry', JSON.stringify(second), { qos: 1 });
    const got = await until(async () => {
      const s = await stored('OXS-1');
      return s.rows.length >= 20 ? s : null;
    }, '20 rows');
    expect(got.rows.filter((r) => r.boot === 'boot-b').map((r) => r.seq)).toEqual([...Array(10).keys()]);
    // the first boot's rows keep their own times: nothing was overwritten
    expect(got.rows.filter((r) => r.boot === 'boot-a').map((r) => new Date(r.ts).toISOString())).toEqual(
      first.map((r) => r.ts),
    );
    await until(async () => (await stored('OXS-1')).c.boot === 'boot-b', 'current boot recorded');
    await d.endAsync();
  });

  it('a reading whose boot and seq were stored with other content is a counted conflict', async () => {
    const d = await demoController(t, 'GRH-1');
    const ts = Date.now() - 5000;
    await d.publishAsync(
      'thawline/v1/GRH-1/telemetry',
      JSON.stringify(reading({ boot: 'k1', seq: 0, ts: new Date(ts).toISOString() })),
      { qos: 1 },
    );
    await until(async () => (await stored('GRH-1')).rows.length === 1, 'first row');
    await d.publishAsync(
      'thawline/v1/GRH-1/telemetry',
      JSON.stringify(reading({ boot: 'k1', seq: 0, ts: new Date(ts + 1000).toISOString() })),
      { qos: 1 },
    );
    const c = await until(async () => {
      const s = await stored('GRH-1');
      return Number(s.c.conflicts) === 1 && s.c;
    }, 'conflict counted');
    const detail = await t.request().get(`/api/controllers/${c.id}`).set(t.as('integrator'));
    expect(detail.body.controller.lastRejects[0].reason).toMatch(/^conflict: boot k1 seq 0/);
    expect((await stored('GRH-1')).rows).toHaveLength(1);
    await d.endAsync();
  });

  it('readings dated 1960, 2040 and 9999 are refused and counted while other controllers keep updating', async () => {
    const bad = await demoController(t, 'TMK-1');
    const good = await demoController(t, 'MRW-1');
    const dates = ['1960-01-01T00:00:00Z', '2040-06-01T00:00:00Z', '9999-12-31T23:59:59Z'];
    await bad.publishAsync(
      'thawline/v1/TMK-1/telemetry',
      JSON.stringify(dates.map((ts, i) => reading({ boot: 'c1', seq: i, ts }))),
      { qos: 1 },
    );
    const before = (await stored('MRW-1')).c.last_seen_at;
    await good.publishAsync('thawline/v1/MRW-1/telemetry', JSON.stringify(reading({ boot: 'c1', seq: 0 })), { qos: 1 });
    await until(async () => {
      const c = (await stored('MRW-1')).c;
      return c.last_seen_at && (!before || c.last_seen_at > before);
    }, 'good controller seen');
    const tmk = await until(async () => {
      const s = await stored('TMK-1');
      return Number(s.c.rejected) === 3 ? s : null;
    }, 'three refused');
    expect(tmk.rows).toHaveLength(0);
    expect(tmk.c.clock_skew_s).toBeGreaterThan(86_400);
    const detail = await t.request().get(`/api/controllers/${tmk.c.id}`).set(t.as('integrator'));
    expect(detail.body.controller.lastRejects.map((r: { reason: string }) => r.reason).join(' ')).toMatch(
      /ahead of the server clock/,
    );
    await bad.endAsync();
    await good.endAsync();
  });
});

describe('a database outage', () => {
  it('holds readings, answers 503 and reports health down, then writes every reading and records one system event', async () => {
    const d = await demoController(t, 'PEW-1');
    const c = await t.db('controllers').where({ serial: 'PEW-1' }).first();
    let seq = 0;
    const send = () =>
      d.publishAsync('thawline/v1/PEW-1/telemetry', JSON.stringify(reading({ boot: 'o1', seq: seq++ })), { qos: 1 });
    for (let i = 0; i < 5; i++) await send();
    // a second device signs in before the outage but sends its first reading during it, when the server cannot look it up
    const quietSerial = 'BRC-1';
    const quiet = await demoController(t, quietSerial);
    const qc = await t.db('controllers').where({ serial: quietSerial }).first();
    await t.proxy!.cut();
    for (let i = 0; i < 3; i++)
      await quiet.publishAsync(
        `thawline/v1/${quietSerial}/telemetry`,
        JSON.stringify(reading({ boot: 'q1', seq: i })),
        { qos: 1 },
      );
    // the device keeps reporting through the outage, and a command result arrives (this used to crash the server)
    for (let i = 0; i < 20; i++) {
      await send();
      await new Promise((r) => setTimeout(r, 350));
    }
    await d.publishAsync(
      'thawline/v1/PEW-1/command/result',
      JSON.stringify({ v: 1, id: 'cmd-x', ok: true, message: 'done' }),
      { qos: 1 },
    );
    const sites = await t.request().get('/api/sites').set(t.as('operator'));
    expect(sites.status).toBe(503);
    expect(sites.body.error.code).toBe('unavailable');
    const health = await t.request().get('/api/health');
    expect(health.status).toBe(503);
    expect(health.body.parts.find((p: { part: string }) => p.part === 'database').state).toBe('down');
    expect(health.body.parts.find((p: { part: string }) => p.part === 'ingest').message).toMatch(/readings buffered/);
    await t.proxy!.restore();
    await until(
      async () => {
        const n = (await t.db('readings').where({ controller_id: c.id }).count({ n: '*' }).first())!.n;
        return Number(n) === 25;
      },
      () => `all 25 readings stored (ingest: ${JSON.stringify(t.ingest.stats)}, buffered ${t.ingest.buffered})`,
      45_000,
    );
    await until(
      async () =>
        Number((await t.db('readings').where({ controller_id: qc.id, boot: 'q1' }).count({ n: '*' }).first())!.n) === 3,
      'the quiet device’s readings, held while it could not be looked up',
      20_000,
    );
    await quiet.endAsync();
    await until(async () => (await t.request().get('/api/health')).status === 200, 'health ok again', 15_000);
    const events = await until(async () => {
      const e = await t.db('system_events').where({ kind: 'database-outage' });
      return e.length && e;
    }, 'outage recorded');
    expect(events).toHaveLength(1);
    // no comms-loss alarm per controller for an outage of the server's own database
    expect(await t.db('alarms').where({ kind: 'silent', controller_id: c.id }).count({ n: '*' }).first()).toEqual({
      n: 0,
    });
    await d.endAsync();
  }, 90_000);
});
