import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

import type { Knex } from 'knex';

import { type AlarmEngine, AlarmMissing, AlarmNotOpen } from '@/server/alarms/engine';
import { AppError, notFound } from '@/server/errors';
import { type AlarmRow, alarmsRepository } from '@/server/repositories/alarms';
import type { auditRepository } from '@/server/repositories/people';
import { AlarmActionError, maxShelveMs } from '@/telemetry/alarms/machine';
import { effectiveRule } from '@/telemetry/alarms/rules';
import type { AlarmView, Person } from '@/telemetry/api';

import { checkedPhoto } from './photos';
import type { ScopeGuard } from './scope';

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
export const toAlarmView = (a: AlarmRow): AlarmView => ({
  id: a.id,
  kind: a.kind,
  priority: a.priority,
  state: a.state,
  siteId: a.site_id,
  controllerId: a.controller_id,
  raisedAt: iso(a.raised_at)!,
  value: a.value,
  message: a.message,
  ackedAt: iso(a.acked_at),
  ackNote: a.ack_note,
  clearedAt: iso(a.cleared_at),
  closedAt: iso(a.closed_at),
  shelvedUntil: iso(a.shelved_until),
});

export function alarmsService(deps: {
  db: Knex;
  engine: AlarmEngine;
  audit: ReturnType<typeof auditRepository>;
  uploadsDir: string;
  guard: ScopeGuard;
}) {
  const repo = alarmsRepository(deps.db);
  const engineAct = async (fn: () => Promise<AlarmRow>) => {
    try {
      return toAlarmView(await fn());
    } catch (e) {
      if (e instanceof AlarmMissing) throw notFound('Alarm');
      if (e instanceof AlarmNotOpen) throw new AppError('conflict', 'This alarm is closed');
      if (e instanceof AlarmActionError) throw new AppError('conflict', e.message);
      throw e;
    }
  };
  return {
    /** A technician sees the alarms of the sites they are on call for. */
    async list(
      actor: Person,
      q: { state?: string; site?: number; priority?: string; open?: '0' | '1'; limit: number },
    ) {
      const siteIds = (await deps.guard.siteFilter(actor, q.site)) ?? undefined;
      const rows = await repo.list({
        states: q.state?.split(','),
        siteIds,
        priority: q.priority,
        open: q.open === '1',
        limit: q.limit,
      });
      return rows.map(toAlarmView);
    },
    async detail(actor: Person, id: number) {
      await deps.guard.alarm(actor, id);
      const a = await repo.byId(id);
      if (!a) throw notFound('Alarm');
      const [events, attachments, rules, c] = await Promise.all([
        repo.events(id),
        repo.attachments(id),
        repo.rules(),
        deps.db('controllers').where({ id: a.controller_id }).first('id', 'site_id', 'antenna_id'),
      ]);
      const place = { controllerId: a.controller_id, antennaId: c?.antenna_id ?? null, siteId: a.site_id };
      // the raising rule's own words, else those of its kind's global rule
      const own = rules.find((r) => r.id === a.rule_id);
      const global = rules.find((r) => r.kind === a.kind && r.scope === 'global');
      return {
        ...toAlarmView(a),
        events: events.map((e) => ({ ...e, at: iso(e.at) })),
        attachments: attachments.map((x) => ({ ...x, at: iso(x.at) })),
        guidance: own?.guidance || global?.guidance || null,
        limits: {
          warning: effectiveRule(rules, 'vswr-warning', place)?.params.limit ?? null,
          trip: effectiveRule(rules, 'vswr-trip', place)?.params.limit ?? null,
        },
      };
    },
    /**
     * Every check first (scope, photo content); then the photo's file, then one
     * transaction with the step, the photo's row and the audit entry. If that
     * fails, the file is removed: nothing is left of a refused acknowledgement.
     * The alarm row is read once here and handed to the engine.
     */
    async acknowledge(actor: Person, id: number, note: string | null, upload?: Buffer) {
      await deps.guard.alarm(actor, id);
      const row = await repo.byId(id);
      if (!row) throw notFound('Alarm');
      const photo = upload ? await checkedPhoto(upload) : null;
      const file = photo ? `${crypto.randomUUID()}.${photo.ext}` : null;
      if (photo && file) await fs.promises.writeFile(path.join(deps.uploadsDir, file), photo.bytes, { flag: 'wx' });
      try {
        return await engineAct(() =>
          deps.engine.act(row, actor.id, { type: 'ack', note }, async (trx) => {
            if (photo && file) {
              await repo.addAttachment(
                { alarm_id: id, person_id: actor.id, file, mime: photo.mime, bytes: photo.bytes.length },
                trx,
              );
            }
            await deps.audit.record(
              {
                personId: actor.id,
                action: 'alarm.ack',
                subject: `alarm:${id}`,
                after: { note, photo: Boolean(photo) },
              },
              trx,
            );
          }),
        );
      } catch (err) {
        if (file) await fs.promises.rm(path.join(deps.uploadsDir, file), { force: true });
        throw err;
      }
    },
    /**
     * Acknowledges several alarms with one note. Every alarm must be in the person's
     * scope, or nothing is done (404). Each is its own step with its own audit entry;
     * an alarm that is already acknowledged or closed is skipped with the reason.
     */
    async acknowledgeMany(actor: Person, ids: number[], note: string | null) {
      const unique = [...new Set(ids)];
      const [rows, scope] = await Promise.all([repo.byIds(unique), deps.guard.scopeOf(actor)]);
      if (rows.length !== unique.length || (scope && rows.some((r) => !scope.has(r.site_id)))) throw notFound('Alarm');
      const acknowledged: number[] = [];
      const skipped: { id: number; reason: string }[] = [];
      for (const row of rows) {
        try {
          await engineAct(() =>
            deps.engine.act(row, actor.id, { type: 'ack', note }, (trx) =>
              deps.audit.record(
                {
                  personId: actor.id,
                  action: 'alarm.ack',
                  subject: `alarm:${row.id}`,
                  after: { note, photo: false, together: unique.length },
                },
                trx,
              ),
            ),
          );
          acknowledged.push(row.id);
        } catch (e) {
          if (!(e instanceof AppError) || e.code !== 'conflict') throw e;
          skipped.push({ id: row.id, reason: e.message });
        }
      }
      return { acknowledged, skipped };
    },
    async shelve(actor: Person, id: number, reason: string, until: string) {
      await deps.guard.alarm(actor, id);
      const row = await repo.byId(id);
      if (!row) throw notFound('Alarm');
      const untilMs = Date.parse(until);
      if (untilMs - Date.now() > maxShelveMs)
        throw new AppError('bad_request', 'An alarm can be shelved for at most 24 hours');
      return engineAct(() =>
        deps.engine.act(id, actor.id, { type: 'shelve', untilMs, reason }, (trx) =>
          deps.audit.record(
            { personId: actor.id, action: 'alarm.shelve', subject: `alarm:${id}`, after: { reason, until } },
            trx,
          ),
        ),
      );
    },
    async unshelve(actor: Person, id: number) {
      await deps.guard.alarm(actor, id);
      const row = await repo.byId(id);
      if (!row) throw notFound('Alarm');
      return engineAct(() =>
        deps.engine.act(row, actor.id, { type: 'unshelve' }, (trx) =>
          deps.audit.record({ personId: actor.id, action: 'alarm.unshelve', subject: `alarm:${id}` }, trx),
        ),
      );
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
      await deps.engine.setOutOfService(controllerId, out, actor.id);
      await deps.audit.record({
        personId: actor.id,
        action: out ? 'controller.out-of-service' : 'controller.in-service',
        subject: `controller:${controllerId}`,
        after: { reason },
      });
    },
  };
}
export type AlarmsService = ReturnType<typeof alarmsService>;
