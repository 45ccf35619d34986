import mqtt from 'mqtt';
import pino from 'pino';
import supertest from 'supertest';
import WebSocket from 'ws';

import { demoPassword, demoPeople } from '@/seeds/01_people';
import { demoControllerPassword } from '@/seeds/03_controllers';
import type { Config } from '@/server/config';
import { openDb } from '@/server/db/knex';
import { startCatcher } from '@/server/mail/catcher';
import { type Running, type StartOptions, startServer } from '@/server/main';
import type { Role } from '@/telemetry/roles';

import { sessionFromSetCookie } from './cookies';
import { createTestDb } from './db';
import { dbProxy } from './db-proxy';

/** The whole server (broker, ingest, live hub, API) on a fresh seeded database. */
export async function testServer(
  opts: StartOptions & { env?: Partial<Record<keyof Config, string>>; throughProxy?: boolean } = {},
) {
  const t = await createTestDb();
  // a real SMTP server on loopback catches what the server sends
  const mail = await startCatcher({ port: 0, dir: t.config.mailDir });
  let config = { ...t.config, SMTP_PORT: mail.port, ...(opts.env ?? {}) } as Config;
  // the server may reach its database through a relay that a test can cut
  const proxy = opts.throughProxy ? await dbProxy(config.DB_PORT) : null;
  if (proxy) config = { ...config, DB_PORT: proxy.port };
  const db = proxy ? openDb(config) : t.db;
  const running: Running = await startServer(config, db, pino({ level: process.env.TEST_LOG ?? 'silent' }), {
    mailEveryMs: 200,
    ...opts,
  });
  const tokens = new Map<Role, string>();
  const request = () => supertest(running.server);
  for (const p of demoPeople) {
    const res = await request().post('/api/auth/sign-in').send({ email: p.email, password: demoPassword });
    tokens.set(p.role, sessionFromSetCookie(res.headers['set-cookie']));
  }
  return {
    ...running,
    db: t.db,
    config,
    mail,
    proxy,
    request,
    as: (role: Role) => ({ Cookie: `thawline_session=${tokens.get(role)}` }),
    token: (role: Role) => tokens.get(role)!,
    async close() {
      await running.stop();
      if (proxy) {
        await db.destroy();
        await proxy.close();
      }
      await mail.close();
      await t.drop();
    },
  };
}
export type TestServer = Awaited<ReturnType<typeof testServer>>;

let seq = 0;
/** A reading as the wire contract defines it. */
export function reading(over: Record<string, unknown> = {}) {
  return {
    v: 1,
    seq: seq++,
    boot: 'test-boot-1',
    ts: new Date().toISOString(),
    airTempC: -2.5,
    humidityPct: 95,
    moisture: true,
    forwardW: 1000,
    reflectedW: 40,
    heater: { mode: 'auto', on: true, currentA: 16.5 },
    supply: { volts: 239.8, batteryPct: null },
    flameProven: null,
    ...over,
  };
}

/** A demo controller connected to the server's embedded broker with the demo password, as a device would. */
export function demoController(t: { broker: { port: number } | null }, serial: string) {
  return mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
    username: serial,
    password: demoControllerPassword,
    reconnectPeriod: 0,
  });
}

/** A /live socket signed in by the session cookie (the only way /live takes a session). */
export function liveSocket(t: TestServer, role: Role | null, headers: Record<string, string> = {}) {
  const cookie = role ? { Cookie: `thawline_session=${t.token(role)}` } : {};
  return new WebSocket(`${t.url.replace('http', 'ws')}/live`, { headers: { ...cookie, ...headers } });
}

/** The HTTP status a refused WebSocket upgrade got. */
export function refusedStatus(ws: WebSocket): Promise<number> {
  return new Promise((resolve) => {
    ws.on('unexpected-response', (_req, res) => resolve(res.statusCode ?? 0));
    ws.on('error', () => {});
    ws.on('open', () => resolve(101));
  });
}
