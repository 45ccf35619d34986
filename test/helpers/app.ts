import pino from 'pino';
import supertest from 'supertest';

import { demoPassword, demoPeople } from '@/seeds/01_people';
import { createApp } from '@/server/app';
import type { Role } from '@/telemetry/roles';

import { sessionFromSetCookie } from './cookies';
import { createTestDb } from './db';

/** The real app on a real, seeded database, plus a signed-in token per role. */
export async function testApp() {
  const { db, config, drop } = await createTestDb();
  const log = pino({ level: 'silent' });
  const app = createApp({ db, config, log });
  const tokens = new Map<Role, string>();
  for (const p of demoPeople) {
    const res = await supertest(app).post('/api/auth/sign-in').send({ email: p.email, password: demoPassword });
    if (res.status !== 200) throw new Error(`demo sign-in failed for ${p.email}: ${res.status}`);
    tokens.set(p.role, sessionFromSetCookie(res.headers['set-cookie']));
  }
  const as = (role: Role) => ({ Cookie: `thawline_session=${tokens.get(role)}` });
  return { app, db, config, as, request: () => supertest(app), close: drop };
}
