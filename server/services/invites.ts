import crypto from 'node:crypto';

import argon2 from 'argon2';
import type { Knex } from 'knex';

import { AppError, notFound } from '@/server/errors';
import { defaultEmailFor, type Outbox } from '@/server/mail/outbox';
import type { auditRepository } from '@/server/repositories/people';
import type { Priority } from '@/telemetry/alarms/machine';
import type { NotificationPrefs, Person } from '@/telemetry/api';
import type { Role } from '@/telemetry/roles';

import type { ScopeGuard } from './scope';

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');
const resetMinutes = 60;
const inviteDays = 7;

/** Invitations by e-mail, on-call lists per site and each person's e-mail choices. */
export function teamService(deps: {
  db: Knex;
  audit: ReturnType<typeof auditRepository>;
  mail: () => Outbox | null;
  publicUrl: string;
  guard: ScopeGuard;
  /** told when who may see what changes (on-call lists), so live sockets are checked again */
  sessionsChanged: () => void;
}) {
  async function onCallOf(siteId: number) {
    if (!(await deps.db('sites').where({ id: siteId }).first())) throw notFound('Site');
    return deps
      .db('site_on_call as o')
      .join('people as p', 'p.id', 'o.person_id')
      .where('o.site_id', siteId)
      .orderBy('o.position')
      .select('p.id', 'p.name', 'p.email', 'p.role', 'o.position');
  }
  return {
    async invite(actor: Person, body: { email: string; name: string; role: Role }) {
      if (await deps.db('people').where({ email: body.email }).first())
        throw new AppError('conflict', 'Someone already has that e-mail address');
      const unusable = await argon2.hash(crypto.randomBytes(32).toString('hex'));
      const [id] = await deps
        .db('people')
        .insert({ email: body.email, name: body.name, role: body.role, password_hash: unusable, active: true });
      const token = crypto.randomBytes(32).toString('base64url');
      await deps.db('invites').insert({
        token_hash: sha256(token),
        person_id: id,
        expires_at: new Date(Date.now() + inviteDays * 86_400_000),
      });
      const mail = deps.mail();
      await mail?.enqueue({
        alarmId: null,
        personId: id,
        to: body.email,
        subject: 'You are invited to Thawline',
        body: `${actor.name} invited you to Thawline as ${body.role}.\n\nChoose your password here (the link works for ${inviteDays} days):\n${deps.publicUrl}/welcome?token=${token}\n`,
      });
      await deps.audit.record({ personId: actor.id, action: 'person.invite', subject: `person:${id}`, after: body });
      return { id, email: body.email, name: body.name, role: body.role, active: true };
    },

    /**
     * Sets a password from a one-time link (an invitation or a reset). The link is
     * taken by one conditional UPDATE, so of several simultaneous uses exactly one
     * wins; a deactivated person's link does nothing; other sessions end.
     */
    async accept(token: string, password: string) {
      const hash = await argon2.hash(password);
      const personId = await deps.db.transaction(async (trx) => {
        const now = new Date();
        const inv = await trx('invites as i')
          .join('people as p', 'p.id', 'i.person_id')
          .where('i.token_hash', sha256(token))
          .first('i.person_id', 'p.active');
        const taken = inv?.active
          ? await trx('invites')
              .where({ token_hash: sha256(token) })
              .whereNull('used_at')
              .andWhere('expires_at', '>', now)
              .update({ used_at: now })
          : 0;
        if (!taken) throw new AppError('bad_request', 'This link has expired or was used already');
        await trx('people').where({ id: inv.person_id }).update({ password_hash: hash });
        await trx('sessions').where({ person_id: inv.person_id, kind: 'browser' }).delete();
        return inv.person_id as number;
      });
      deps.sessionsChanged();
      await deps.audit.record({ personId, action: 'auth.password-set', subject: `person:${personId}` });
      const p = await deps.db('people').where({ id: personId }).first('email');
      return { email: p.email as string };
    },

    /**
     * A one-time link to choose a new password, e-mailed to the person (valid one
     * hour). Asked for by the person (by e-mail address, with no answer that tells
     * whether the address is known) or sent by an administrator.
     */
    async sendReset(email: string, by: Person | null) {
      const p = await deps.db('people').where({ email, active: true }).first('id', 'email', 'role');
      if (!p || p.role === 'kiosk') {
        await deps.audit.record({ personId: by?.id ?? null, action: 'auth.reset-unknown', subject: `email:${email}` });
        return;
      }
      const token = crypto.randomBytes(32).toString('base64url');
      await deps.db('invites').insert({
        token_hash: sha256(token),
        person_id: p.id,
        expires_at: new Date(Date.now() + resetMinutes * 60_000),
      });
      await deps.mail()?.enqueue({
        alarmId: null,
        personId: p.id,
        to: p.email,
        subject: 'Choose a new Thawline password',
        body:
          `${by ? `${by.name} sent you` : 'Someone (probably you) asked for'} a link to choose a new Thawline password.\n\n` +
          `It works once, for ${resetMinutes} minutes, and signs you out everywhere else:\n${deps.publicUrl}/welcome?token=${token}&reset=1\n\n` +
          'If you did not ask for it, you can ignore this e-mail: your password stays as it is.\n',
      });
      await deps.audit.record({ personId: by?.id ?? p.id, action: 'auth.reset-sent', subject: `person:${p.id}` });
    },

    async onCall(actor: Person, siteId: number) {
      await deps.guard.site(actor, siteId);
      return onCallOf(siteId);
    },

    async setOnCall(actor: Person, siteId: number, personIds: number[]) {
      if (!(await deps.db('sites').where({ id: siteId }).first())) throw notFound('Site');
      if (new Set(personIds).size !== personIds.length)
        throw new AppError('bad_request', 'A person can be on the list only once');
      const found = await deps.db('people').whereIn('id', personIds).andWhere('active', true).pluck('id');
      if (found.length !== personIds.length)
        throw new AppError('bad_request', 'Everyone on call must be an active person');
      const before = await onCallOf(siteId);
      await deps.db.transaction(async (trx) => {
        await trx('site_on_call').where({ site_id: siteId }).delete();
        if (personIds.length)
          await trx('site_on_call').insert(
            personIds.map((person_id, position) => ({ site_id: siteId, person_id, position })),
          );
      });
      await deps.audit.record({
        personId: actor.id,
        action: 'site.on-call',
        subject: `site:${siteId}`,
        before: before.map((p) => p.id),
        after: personIds,
      });
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
      await deps
        .db('notification_prefs')
        .insert(
          (Object.keys(prefs) as Priority[]).map((priority) => ({
            person_id: personId,
            priority,
            email: prefs[priority],
          })),
        )
        .onConflict(['person_id', 'priority'])
        .merge();
      return this.prefs(personId);
    },
  };
}
export type TeamService = ReturnType<typeof teamService>;
