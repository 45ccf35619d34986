import pino from 'pino';
import supertest from 'supertest';
import type { Config } from '../../server/config';
import { startServer, type Running, type StartOptions } from '../../server/main';
import { demoPassword, demoPeople } from '../../seeds/01_people';
import type { Role } from '../../telemetry/roles';
import { createTestDb } from './db';
import { startCatcher } from '../../server/mail/catcher';

/** The whole server (broker, ingest, live hub, API) on a fresh seeded database. */
export async function testServer(opts: StartOptions & { env?: Partial<Record<keyof Config, string>> } = {}) {
  const t = await createTestDb();
  // a real SMTP server on loopback catches what the server sends
  const mail = await startCatcher({ port: 0 });
  const config = { ...t.config, SMTP_PORT: mail.port, ...(opts.env ?? {}) } as Config;
  const running: Running = await startServer(config, t.db, pino({ level: process.env.TEST_LOG ?? 'silent' }), { mailEveryMs: 200, ...opts });
  const tokens = new Map<Role, string>();
  const request = () => supertest(running.server);
  for (const p of demoPeople) {
    const res = await request().post('/api/auth/sign-in').send({ email: p.email, password: demoPassword });
    tokens.set(p.role, res.body.token);
  }
  return {
    ...running,
    db: t.db,
    config,
    mail,
    request,
    as: (role: Role) => ({ Authorization: `Bearer ${tokens.get(role)}` }),
    token: (role: Role) => tokens.get(role)!,
    async close() {
      await running.stop();
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
    v: 1, seq: seq++, ts: new Date().toISOString(), airTempC: -2.5, humidityPct: 95, moisture: true,
    forwardW: 1000, reflectedW: 40, heater: { mode: 'auto', on: true, currentA: 16.5 },
    supply: { volts: 239.8, batteryPct: null }, flameProven: null, ...over,
  };
}
