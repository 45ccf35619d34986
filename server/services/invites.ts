import argon2 from 'argon2';
import crypto from 'node:crypto';
import type { Knex } from 'knex';
import type { NotificationPrefs, Person } from '../../telemetry/api';
import type { Priority } from '../../telemetry/alarms/machine';
import type { Role } from '../../telemetry/roles';
import { AppError, notFound } from '../errors';
import { defaultEmailFor, type Outbox } from '../mail/outbox';
import type { ScopeGuard } from './scope';
import type { auditRepository } from '../repositories/people';

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');
const inviteDays = 7;

/** Invitations by e-mail, on-call lists per site and each person's e-mail choices. */
export function teamService(deps: {
  db: Knex; audit: ReturnType<typeof auditRepository>; mail: () => Outbox | null; publicUrl: string; guard: ScopeGuard;
  /** told when who may see what changes (on-call lists), so live sockets are checked again */
  sessionsChanged: () => void;
}) {
  async function onCallOf(siteId: number) {
    if (!(await deps.db('sites').where({ id: siteId }).first())) throw notFound('Site');
    return deps.db('site_on_call as o').join('people as p', 'p.id', 'o.person_id').where('o.site_id', siteId).orderBy('o.position')
      .select('p.id', 'p.name', 'p.email', 'p.role', 'o.position');
  }
  return {
    async invite(actor: Person, body: { email: string; name: string; role: Role }) {
      if (await deps.db('people').where({ email: body.email }).first()) throw new AppError('conflict', 'Someone already has that e-mail address');
      const unusable = await argon2.hash(crypto.randomBytes(32).toString('hex'));
      const [id] = await deps.db('people').insert({ email: body.email, name: body.name, role: body.role, password_hash: unusable, active: true });
      const token = crypto.randomBytes(32).toString('base64url');
      await deps.db('invites').insert({ token_hash: sha256(token), person_id: id, expires_at: new Date(Date.now() + inviteDays * 86_400_000) });
      const mail = deps.mail();
      await mail?.enqueue({
        alarmId: null, personId: id, to: body.email, subject: 'You are invited to Thawline',
        body: `${actor.name} invited you to Thawline as ${body.role}.\n\nChoose your password here (the link works for ${inviteDays} days):\n${deps.publicUrl}/welcome?token=${token}\n`,
      });
      await deps.audit.record({ personId: actor.id, action: 'person.invite', subject: `person:${id}`, after: body });
      return { id, email: body.email, name: body.name, role: body.role, active: true };
    },

    async accept(token: string, password: string) {
      const inv = await deps.db('invites').where({ token_hash: sha256(token) }).first();
      if (!inv || inv.used_at || new Date(inv.expires_at).getTime() < Date.now()) throw new AppError('bad_request', 'This invitation has expired or was used already');
      await deps.db.transaction(async (trx) => {
        await trx('people').where({ id: inv.person_id }).update({ password_hash: await argon2.hash(password) });
        await trx('invites').where({ token_hash: inv.token_hash }).update({ used_at: new Date() });
      });
      const p = await deps.db('people').where({ id: inv.person_id }).first('email');
      return { email: p.email as string };
    },

    async onCall(actor: Person, siteId: number) {
      await deps.guard.site(actor, siteId);
      return onCallOf(siteId);
    },

    async setOnCall(actor: Person, siteId: number, personIds: number[]) {
      if (!(await deps.db('sites').where({ id: siteId }).first())) throw notFound('Site');
      if (new Set(personIds).size !== personIds.length) throw new AppError('bad_request', 'A person can be on the list only once');
      const found = await deps.db('people').whereIn('id', personIds).andWhere('active', true).pluck('id');
      if (found.length !== personIds.length) throw new AppError('bad_request', 'Everyone on call must be an active person');
      const before = await onCallOf(siteId);
      await deps.db.transaction(async (trx) => {
        await trx('site_on_call').where({ site_id: siteId }).delete();
        if (personIds.length) await trx('site_on_call').insert(personIds.map((person_id, position) => ({ site_id: siteId, person_id, position })));
      });
      await deps.audit.record({ personId: actor.id, action: 'site.on-call', subject: `site:${siteId}`, before: before.map((p) => p.id), after: personIds });
      deps.sessionsChanged();
      return onCallOf(siteId);
    },

    async prefs(personId: number): Promise<NotificationPrefs> {
      const rows = await deps.db('notification_prefs').where({ person_id: personId });
      const out = { ...defaultEmailFor };
      for (const r of rows) out[r.priority as Priority] = Boolean(r.email);
      return out;
    },

    async setPrefs(personId: number, prefs: NotificationPrefs) {
      await deps.db('notification_prefs').insert((Object.keys(prefs) as Priority[]).map((priority) => ({ person_id: personId, priority, email: prefs[priority] }))).onConflict(['person_id', 'priority']).merge();
      return this.prefs(personId);
    },
  };
}
export type TeamService = ReturnType<typeof teamService>;
