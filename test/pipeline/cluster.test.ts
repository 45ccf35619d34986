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
type Inst = Running & { db: ReturnType<typeof openDb>; cookie: string };
let broker: Awaited<ReturnType<typeof startMosquitto>>;
let base: Awaited<ReturnType<typeof createTestDb>>;
let mail: Awaited<ReturnType<typeof startCatcher>>;
const inst: Record<string, Inst> = {};

async function start(id: string): Promise<Inst> {
  const config = {
    ...base.config,
    SMTP_PORT: mail.port,
    CLUSTER: true,
    INSTANCE_ID: id,
    MQTT_URL: broker.url,
  } as Config;
  const db = openDb(config);
  const running = await startServer(config, db, pino({ level: process.env.TEST_LOG ?? 'silent' }), {
    mailEveryMs: 200,
    ingest: { flushMs: 50, gapCheckMs: 1000 },
  });
  const res = await supertest(running.server)
    .post('/api/auth/sign-in')
    .send({ email: 'operator@demo.thawline.test', password: demoPassword });
  return { ...running, db, cookie: `thawline_session=${sessionFromSetCookie(res.headers['set-cookie'])}` };
}

const holders = async () =>
  (await base.db('controller_leases').whereNotNull('holder').andWhere('expires_at', '>', base.db.fn.now(3))) as {
    controller_id: number;
    holder: string;
    fence: number;
  }[];

beforeAll(async () => {
  broker = await startMosquitto();
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

  it('a reading is stored once by its owner and reaches browsers on every instance', async () => {
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
    const ktp = await base.db('controllers').where({ serial: 'KTP-1' }).first();
    const c = await mqtt.connectAsync(broker.url, { clientId: 'KTP-1', reconnectPeriod: 0 });
    await c.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(reading({ seq: 0, boot: 'k1' })), { qos: 1 });
    await until(() => got.every((g) => g.includes(ktp.id)), 'the reading on /live of all three instances');
    await until(
      async () => Number((await base.db('readings').where({ controller_id: ktp.id }).count({ n: '*' }))[0].n) === 1,
      'one row',
    );
    await new Promise((r) => setTimeout(r, 300));
    expect(Number((await base.db('readings').where({ controller_id: ktp.id }).count({ n: '*' }))[0].n)).toBe(1);
    for (const ws of sockets) ws.close();
    await c.endAsync();
  });

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
