import crypto from 'node:crypto';

import type { Knex } from 'knex';

import type { AlarmEngine } from '@/server/alarms/engine';
import { AppError, notFound } from '@/server/errors';
import type { auditRepository } from '@/server/repositories/people';
import type { Person } from '@/telemetry/api';
import { classifyIcing } from '@/telemetry/math/icing';
import { topics } from '@/telemetry/wire';

import type { ScopeGuard } from './scope';

/** Heater overrides: audited, sent on the controller's command topic, result recorded when it answers. */
export function commandsService(deps: {
  db: Knex;
  audit: ReturnType<typeof auditRepository>;
  engine: AlarmEngine;
  publish: () => ((topic: string, payload: string) => Promise<void>) | null;
  guard: ScopeGuard;
}) {
  return {
    async heater(
      actor: Person,
      controllerId: number,
      body: { mode: 'auto' | 'forced-on' | 'forced-off'; untilMinutes?: number; reason: string; confirm?: boolean },
    ) {
      await deps.guard.controller(actor, controllerId);
      const c = await deps.db('controllers').where({ id: controllerId }).first();
      if (!c || c.decommissioned) throw notFound('Controller');
      if (c.kind === 'radome-sensor') throw new AppError('bad_request', 'This controller has no heater');
      if (body.mode !== 'auto' && !body.untilMinutes)
        throw new AppError('bad_request', 'A forced mode needs an expiry', [
          { path: 'untilMinutes', message: 'Required for forced modes' },
        ]);
      const last = await deps.db('readings').where({ controller_id: controllerId }).orderBy('ts', 'desc').first();
      const icing = last
        ? classifyIcing({
            airTempC: last.air_temp_c,
            humidityPct: last.humidity_pct,
            moisture: last.moisture == null ? null : Boolean(last.moisture),
          }).state
        : 'none';
      const risky = body.mode === 'forced-off' && (icing === 'active' || icing === 'likely');
      if (risky && !body.confirm) {
        throw new AppError(
          'conflict',
          `Icing is ${icing} at this controller: forcing the heater off lets ice build. Confirm to go ahead.`,
          { needsConfirmation: true, icing },
        );
      }
      const publish = deps.publish();
      if (!publish) throw new AppError('unavailable', 'The broker is not connected');
      const id = crypto.randomUUID();
      const until = body.mode === 'auto' ? null : new Date(Date.now() + body.untilMinutes! * 60_000);
      await deps.db('commands').insert({
        id,
        controller_id: controllerId,
        type: 'heater',
        mode: body.mode,
        until,
        reason: body.reason,
        person_id: actor.id,
        sent_at: new Date(),
      });
      await deps.audit.record({
        personId: actor.id,
        action: 'heater.command',
        subject: `controller:${controllerId}`,
        after: { id, mode: body.mode, until, reason: body.reason, icing },
      });
      await publish(
        topics(c.serial).command,
        JSON.stringify({
          v: 1,
          id,
          type: 'heater',
          mode: body.mode,
          until: until?.toISOString() ?? null,
          reason: body.reason,
        }),
      );
      await deps.engine.manualCondition(
        `heater-forced-off:${controllerId}`,
        controllerId,
        risky,
        until?.getTime() ?? null,
        `heater forced off during icing by ${actor.name} (${body.reason})`,
      );
      return { id, mode: body.mode, until: until?.toISOString() ?? null, icing };
    },

    async recordResult(r: { controllerId: number; id: string; ok: boolean; message: string }) {
      const n = await deps
        .db('commands')
        .where({ id: r.id, controller_id: r.controllerId })
        .update({ result_ok: r.ok, result_message: r.message.slice(0, 500), result_at: new Date() });
      if (n)
        await deps.audit.record({
          personId: null,
          action: 'heater.result',
          subject: `controller:${r.controllerId}`,
          after: r,
        });
      return n > 0;
    },

    async list(actor: Person, controllerId: number) {
      await deps.guard.controller(actor, controllerId);
      return deps
        .db('commands as c')
        .leftJoin('people as p', 'p.id', 'c.person_id')
        .where('c.controller_id', controllerId)
        .orderBy('c.sent_at', 'desc')
        .limit(20)
        .select(
          'c.id',
          'c.type',
          'c.mode',
          'c.until',
          'c.reason',
          'c.sent_at as sentAt',
          'c.result_ok as resultOk',
          'c.result_message as resultMessage',
          'c.result_at as resultAt',
          'p.name as person',
        );
    },
  };
}
export type CommandsService = ReturnType<typeof commandsService>;
