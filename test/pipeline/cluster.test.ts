import mqtt from 'mqtt';
import pino from 'pino';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import WebSocket from 'ws';

import { demoPassword } from '@/seeds/01_people';
import { LeaseLost } from '@/server/cluster/membership';
import type { Config } from '@/server/config';
import { openDb } from '@/server/db/knex';
import { startCatcher } from '@/server/mail/catcher';
import { type Running, startServer } from '@/server/main';
import { sessionFromSetCookie } from '@/test/helpers/cookies';
import { createTestDb } from '@/test/helpers/db';
import { startMosquitto } from '@/test/helpers/mosquitto';
import { reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

/**
 * Three instances (a, b, c) on one database and one mosquitto, as CLUSTER=1 runs
 * them: every controller owned by one live instance, readings shown by all, the
 * owner's leases taken over when it stops heartbeating, and its late writes fenced off.
 */
type Inst = Running & { db: ReturnType<typeof openDb>; cookie: string; admin: string };
let broker: Awaited<ReturnType<typeof startMosquitto>>;
let base: Awaited<ReturnType<typeof createTestDb>>;
let mail: Awaited<ReturnType<typeof startCatcher>>;
const inst: Record<string, Inst> = {};
const adminPassword = 'dynsec-admin-for-tests';

async function start(id: string): Promise<Inst> {
  const config = {
    ...base.config,
    SMTP_PORT: mail.port,
    CLUSTER: true,
    INSTANCE_ID: id,
    MQTT_URL: broker.url,
    MQTT_DYNSEC: true,
    MQTT_USERNAME: 'thawline-server',
    MQTT_PASSWORD: 'server-password-for-tests',
    MQTT_ADMIN_USERNAME: 'admin',
    MQTT_ADMIN_PASSWORD: adminPassword,
  } as Config;
  const db = openDb(config);
  const running = await startServer(config, db, pino({ level: process.env.TEST_LOG ?? 'silent' }), {
    mailEveryMs: 200,
    ingest: { flushMs: 50, gapCheckMs: 1000 },
  });
  const signIn = async (email: string) => {
    const res = await supertest(running.server).post('/api/auth/sign-in').send({ email, password: demoPassword });
    return `thawline_session=${sessionFromSetCookie(res.headers['set-cookie'])}`;
  };
  return {
    ...running,
    db,
    cookie: await signIn('operator@demo.thawline.test'),
    admin: await signIn('admin@demo.thawline.test'),
  };
}

const holders = async () =>
  (await base.db('controller_leases').whereNotNull('holder').andWhere('expires_at', '>', base.db.fn.now(3))) as {
    controller_id: number;
    holder: string;
    fence: number;
  }[];

beforeAll(async () => {
  broker = await startMosquitto({ dynsec: { adminPassword } });
  base = await createTestDb();
  mail = await startCatcher({ port: 0, dir: base.config.mailDir });
  for (const id of ['a', 'b', 'c']) inst[id] = await start(id);
}, 60_000);
afterAll(async () => {
  for (const i of Object.values(inst)) {
    await i.stop().catch(() => {});
    await i.db.destroy();
  }
  await mail?.close();
  await base?.drop();
  await broker?.stop();
});

describe('three instances on one database and one broker', () => {
  it('share the controllers out: each owned by exactly one, all three holding some', async () => {
    const ids = (await base.db('controllers').where({ decommissioned: false }).pluck('id')) as number[];
    const held = await until(async () => {
      await Promise.all(Object.values(inst).map((i) => i.membership!.beat()));
      const h = await holders();
      return h.length === ids.length && new Set(h.map((x) => x.holder)).size === 3 ? h : null;
    }, 'every controller leased, to all three instances');
    for (const i of Object.values(inst)) {
      const mine = held.filter((h) => h.holder === i.membership!.id).map((h) => h.controller_id);
      expect(i.membership!.ownedIds().sort()).toEqual(mine.sort());
    }
  });

  it('a controller enrolled through one instance signs in at mosquitto, is stored once and is live on all three', async () => {
    const enrol = await supertest(inst.a.server)
      .post('/api/controllers')
      .set('Cookie', inst.a.admin)
      .send({ serial: 'CLU-1', siteId: 2, kind: 'heater', intervalS: 1 });
    expect(enrol.status, JSON.stringify(enrol.body)).toBe(201);
    const { id, mqtt: creds } = enrol.body as { id: number; mqtt: { username: string; password: string } };
    // the broker knows it at once: a wrong password is refused, the right one taken
    await expect(
      mqtt.connectAsync(broker.url, { username: 'CLU-1', password: 'wrong', reconnectPeriod: 0 }),
    ).rejects.toThrow();
    const sockets = Object.values(inst).map(
      (i) => new WebSocket(`${i.url.replace('http', 'ws')}/live`, { headers: { Cookie: i.cookie } }),
    );
    const got = sockets.map(() => [] as number[]);
    sockets.forEach((ws, k) =>
      ws.on('message', (d) => {
        const m = JSON.parse(String(d));
        if (m.type === 'readings') for (const r of m.items) got[k].push(r.controllerId);
      }),
    );
    await Promise.all(sockets.map((ws) => new Promise((r) => ws.once('open', r))));
    const c = await mqtt.connectAsync(broker.url, {
      username: creds.username,
      password: creds.password,
      reconnectPeriod: 0,
    });
    // its own topic only: a reading sent as another controller goes nowhere
    await c.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await until(async () => {
      await Promise.all(Object.values(inst).map((i) => i.membership!.beat()));
      return (await holders()).some((h) => h.controller_id === id);
    }, 'the new controller leased');
    await c.publishAsync('thawline/v1/CLU-1/telemetry', JSON.stringify(reading({ seq: 0, boot: 'c1' })), { qos: 1 });
    await until(
      () => got.every((g) => g.includes(id)),
      () =>
        `the reading on /live of all three instances; broker said:\n${broker
          .log()
          .split('\n')
          .filter((l) => /Denied|denied|CLU-1|thawline-server|telemetry/.test(l))
          .slice(-25)
          .join('\n')}`,
    );
    await until(
      async () => Number((await base.db('readings').where({ controller_id: id }).count({ n: '*' }))[0].n) === 1,
      'one row',
    );
    // seen online through instance c
    const seen = await until(async () => {
      const r = await supertest(inst.c.server).get(`/api/controllers/${id}`).set('Cookie', inst.c.cookie);
      return r.body.controller?.status === 'online' ? r.body.controller : null;
    }, 'online through instance c');
    expect(seen.serial).toBe('CLU-1');
    const ktp = await base.db('controllers').where({ serial: 'KTP-1' }).first();
    expect(Number((await base.db('readings').where({ controller_id: ktp.id }).count({ n: '*' }))[0].n)).toBe(0);
    for (const ws of sockets) ws.close();

    // a new password through b: the old one no longer signs in; decommissioned through c: no account at all
    const rotated = await supertest(inst.b.server).post(`/api/controllers/${id}/password`).set('Cookie', inst.b.admin);
    expect(rotated.status, JSON.stringify(rotated.body)).toBe(200);
    await expect(
      mqtt.connectAsync(broker.url, { username: 'CLU-1', password: creds.password, reconnectPeriod: 0 }),
    ).rejects.toThrow();
    const again = await mqtt.connectAsync(broker.url, {
      username: 'CLU-1',
      password: rotated.body.mqtt.password,
      reconnectPeriod: 0,
    });
    await again.endAsync();
    const gone = await supertest(inst.c.server).post(`/api/controllers/${id}/decommission`).set('Cookie', inst.c.admin);
    expect(gone.status, JSON.stringify(gone.body)).toBe(200);
    await expect(
      mqtt.connectAsync(broker.url, { username: 'CLU-1', password: rotated.body.mqtt.password, reconnectPeriod: 0 }),
    ).rejects.toThrow();
    await c.endAsync().catch(() => {});
  }, 30_000);

  it('when one stops heartbeating its controllers are owned again within 15 s; its late writes are refused', async () => {
    const victim = inst.a;
    const before = (await holders()).filter((h) => h.holder === 'a');
    expect(before.length).toBeGreaterThan(0);
    const t0 = Date.now();
    // as if the process froze: no more heartbeats, leases not handed back
    await victim.membership!.stop(false);
    const after = await until(
      async () => {
        const h = await holders();
        const moved = before.map((b) => h.find((x) => x.controller_id === b.controller_id));
        return moved.every((m) => m && m.holder !== 'a') ? moved : null;
      },
      'the stopped instance’s controllers owned by the others',
      20_000,
    );
    const tookS = (Date.now() - t0) / 1000;
    expect(tookS).toBeLessThan(15);
    // each lease changed hands: its fencing number grew
    for (const [k, m] of after.entries()) expect(Number(m!.fence)).toBeGreaterThan(Number(before[k].fence));
    // a write the old owner would still try is refused inside its transaction
    await expect(
      victim.db.transaction((trx) =>
        // the victim's own idea of its fence, which the database no longer agrees with
        victim.membership!.checkFence(trx, before[0].controller_id),
      ),
    ).rejects.toBeInstanceOf(LeaseLost);
  }, 30_000);
});
