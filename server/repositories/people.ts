import type { Knex } from 'knex';

import type { Person } from '@/telemetry/api';
import type { Role } from '@/telemetry/roles';

type Row = { id: number; email: string; name: string; role: Role; active: number | boolean; password_hash: string };

const toPerson = (r: Row): Person => ({
  id: r.id,
  email: r.email,
  name: r.name,
  role: r.role,
  active: Boolean(r.active),
});

export function peopleRepository(db: Knex) {
  return {
    async byEmailWithHash(email: string) {
      const r = await db<Row>('people').where({ email }).first();
      return r ? { person: toPerson(r), hash: r.password_hash } : null;
    },
    async byId(id: number): Promise<Person | null> {
      const r = await db<Row>('people').where({ id }).first();
      return r ? toPerson(r) : null;
    },
    async list(): Promise<Person[]> {
      return (await db<Row>('people').orderBy('name')).map(toPerson);
    },
    async create(p: { email: string; name: string; role: Role; passwordHash: string }): Promise<number> {
      const [id] = await db('people').insert({
        email: p.email,
        name: p.name,
        role: p.role,
        password_hash: p.passwordHash,
        active: true,
      });
      return id;
    },
    async update(id: number, patch: Partial<{ name: string; role: Role; active: boolean }>): Promise<void> {
      await db('people').where({ id }).update(patch);
    },
  };
}

export function sessionsRepository(db: Knex) {
  return {
    async create(tokenHash: string, personId: number, expiresAt: Date, api?: { name: string; publicId: string }) {
      await db('sessions').insert({
        token_hash: tokenHash,
        person_id: personId,
        expires_at: expiresAt,
        kind: api ? 'api' : 'browser',
        name: api?.name ?? null,
        public_id: api?.publicId ?? null,
      });
    },
    async personFor(tokenHash: string, now: Date, kind: 'browser' | 'api' = 'browser'): Promise<Person | null> {
      const r = await db('sessions as s')
        .join('people as p', 'p.id', 's.person_id')
        .where('s.token_hash', tokenHash)
        .andWhere('s.kind', kind)
        .andWhere('s.expires_at', '>', now)
        .andWhere('p.active', true)
        .first<Row>('p.id', 'p.email', 'p.name', 'p.role', 'p.active', 'p.password_hash');
      return r ? toPerson(r) : null;
    },
    async remove(tokenHash: string) {
      await db('sessions').where({ token_hash: tokenHash }).delete();
    },
    apiTokens: (personId: number) =>
      db('sessions')
        .where({ person_id: personId, kind: 'api' })
        .orderBy('created_at')
        .select('public_id as id', 'name', 'created_at as createdAt', 'expires_at as expiresAt'),
    revokeApiToken: (personId: number, publicId: string) =>
      db('sessions').where({ person_id: personId, kind: 'api', public_id: publicId }).delete(),
    /** every browser session of a person (sign out everywhere); API tokens stay unless `withTokens` */
    async removeFor(personId: number, withTokens = true) {
      const q = db('sessions').where({ person_id: personId });
      if (!withTokens) q.andWhere('kind', 'browser');
      await q.delete();
    },
  };
}

export function auditRepository(db: Knex) {
  return {
    async record(
      e: { personId: number | null; action: string; subject: string; before?: unknown; after?: unknown },
      q: Knex | Knex.Transaction = db,
    ) {
      await q('audit_log').insert({
        person_id: e.personId,
        action: e.action,
        subject: e.subject,
        before: e.before === undefined ? null : JSON.stringify(e.before),
        after: e.after === undefined ? null : JSON.stringify(e.after),
      });
    },
  };
}
