import fs from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import type { AlarmView, Person } from '../../telemetry/api';
import { AlarmActionError, maxShelveMs } from '../../telemetry/alarms/machine';
import { AlarmNotOpen, type AlarmEngine } from '../alarms/engine';
import { AppError, notFound } from '../errors';
import { alarmsRepository, type AlarmRow } from '../repositories/alarms';
import type { auditRepository } from '../repositories/people';
import type { ScopeGuard } from './scope';

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
export const toAlarmView = (a: AlarmRow): AlarmView => ({
  id: a.id, kind: a.kind, priority: a.priority, state: a.state, siteId: a.site_id, controllerId: a.controller_id,
  raisedAt: iso(a.raised_at)!, value: a.value, message: a.message, ackedAt: iso(a.acked_at), ackNote: a.ack_note,
  clearedAt: iso(a.cleared_at), closedAt: iso(a.closed_at), shelvedUntil: iso(a.shelved_until),
});

/** JPEG and PNG by their first bytes, not only by what the browser claims. */
function looksLikeImage(file: string, mime: string): boolean {
  const head = Buffer.alloc(8);
  const fd = fs.openSync(file, 'r');
  fs.readSync(fd, head, 0, 8, 0);
  fs.closeSync(fd);
  if (mime === 'image/jpeg') return head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff;
  return head.equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
}

export function alarmsService(deps: { db: Knex; engine: () => AlarmEngine; audit: ReturnType<typeof auditRepository>; uploadsDir: string; guard: ScopeGuard }) {
  const repo = alarmsRepository(deps.db);
  const engineAct = async (fn: () => Promise<AlarmRow>) => {
    try {
      return toAlarmView(await fn());
    } catch (e) {
      if (e instanceof AlarmNotOpen) throw new AppError('conflict', 'This alarm is closed');
      if (e instanceof AlarmActionError) throw new AppError('conflict', e.message);
      throw e;
    }
  };
  return {
    /** A technician sees the alarms of the sites they are on call for. */
    async list(actor: Person, q: { state?: string; site?: number; priority?: string; open?: '0' | '1'; limit: number }) {
      const siteIds = (await deps.guard.siteFilter(actor, q.site)) ?? undefined;
      const rows = await repo.list({ states: q.state?.split(','), siteIds, priority: q.priority, open: q.open === '1', limit: q.limit });
      return rows.map(toAlarmView);
    },
    async detail(actor: Person, id: number) {
      await deps.guard.alarm(actor, id);
      const a = await repo.byId(id);
      if (!a) throw notFound('Alarm');
      const [events, attachments] = await Promise.all([repo.events(id), repo.attachments(id)]);
      return { ...toAlarmView(a), events: events.map((e) => ({ ...e, at: iso(e.at) })), attachments: attachments.map((x) => ({ ...x, at: iso(x.at) })) };
    },
    async acknowledge(actor: Person, id: number, note: string | null, photo?: { path: string; mimetype: string; size: number }) {
      await deps.guard.alarm(actor, id);
      if (!(await repo.byId(id))) throw notFound('Alarm');
      if (photo && !looksLikeImage(photo.path, photo.mimetype)) {
        fs.rmSync(photo.path, { force: true });
        throw new AppError('bad_request', 'The photo must be a JPEG or PNG image');
      }
      const view = await engineAct(() => deps.engine().act(id, actor.id, { type: 'ack', note }));
      if (photo) await repo.addAttachment({ alarm_id: id, person_id: actor.id, file: path.basename(photo.path), mime: photo.mimetype, bytes: photo.size });
      return view;
    },
    async shelve(actor: Person, id: number, reason: string, until: string) {
      await deps.guard.alarm(actor, id);
      if (!(await repo.byId(id))) throw notFound('Alarm');
      const untilMs = Date.parse(until);
      if (untilMs - Date.now() > maxShelveMs) throw new AppError('bad_request', 'An alarm can be shelved for at most 24 hours');
      const view = await engineAct(() => deps.engine().act(id, actor.id, { type: 'shelve', untilMs, reason }));
      await deps.audit.record({ personId: actor.id, action: 'alarm.shelve', subject: `alarm:${id}`, after: { reason, until } });
      return view;
    },
    async unshelve(actor: Person, id: number) {
      await deps.guard.alarm(actor, id);
      if (!(await repo.byId(id))) throw notFound('Alarm');
      return engineAct(() => deps.engine().act(id, actor.id, { type: 'unshelve' }));
    },
    async attachment(actor: Person, id: number) {
      await deps.guard.attachment(actor, id);
      const a = await repo.attachment(id);
      if (!a) throw notFound('Attachment');
      return { file: path.join(deps.uploadsDir, a.file), mime: a.mime as string };
    },
    async setOutOfService(actor: Person, controllerId: number, out: boolean, reason: string) {
      await deps.guard.controller(actor, controllerId);
      const c = await deps.db('controllers').where({ id: controllerId }).first();
      if (!c) throw notFound('Controller');
      await deps.engine().setOutOfService(controllerId, out, actor.id);
      await deps.audit.record({ personId: actor.id, action: out ? 'controller.out-of-service' : 'controller.in-service', subject: `controller:${controllerId}`, after: { reason } });
    },
  };
}
export type AlarmsService = ReturnType<typeof alarmsService>;
