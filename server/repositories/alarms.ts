import type { Knex } from 'knex';

import type { AlarmMachine, Priority } from '@/telemetry/alarms/machine';
import type { Rule, RuleKind } from '@/telemetry/alarms/rules';

export type AlarmRow = {
  id: number;
  source: string;
  kind: RuleKind;
  rule_id: number | null;
  controller_id: number;
  site_id: number;
  priority: Priority;
  state: string;
  value: number | null;
  message: string;
  machine: string | AlarmMachine;
  raised_at: Date;
  acked_at: Date | null;
  acked_by: number | null;
  ack_note: string | null;
  cleared_at: Date | null;
  closed_at: Date | null;
  shelved_until: Date | null;
  shelve_reason: string | null;
  escalation_level: number;
  open_source: string | null;
};

const json = <T>(v: unknown): T => (typeof v === 'string' ? JSON.parse(v) : v) as T;

export const toRule = (r: Record<string, unknown>): Rule => ({
  id: r.id as number,
  kind: r.kind as RuleKind,
  scope: r.scope as Rule['scope'],
  scopeId: (r.scope_id as number | null) ?? null,
  enabled: Boolean(r.enabled),
  priority: r.priority as Priority,
  params: json(r.params),
  onDelayS: r.on_delay_s as number,
  offDelayS: r.off_delay_s as number,
  deadband: Number(r.deadband),
  guidance: (r.guidance as string | null) ?? null,
});

export function alarmsRepository(db: Knex) {
  return {
    rules: async () => (await db('alarm_rules').orderBy('id')).map(toRule),
    rule: async (id: number) => {
      const r = await db('alarm_rules').where({ id }).first();
      return r ? toRule(r) : null;
    },
    sources: () => db('alarm_sources').select('source', 'machine', 'alarm_id'),
    /** the alarm sources of given controllers (a source is named "<kind>:<controller id>") */
    sourcesOf: (controllerIds: number[]) =>
      db('alarm_sources')
        .whereRaw(
          `SUBSTRING_INDEX(source, ':', -1) IN (${controllerIds.map(() => '?').join(',')})`,
          controllerIds.map(String),
        )
        .select('source', 'machine', 'alarm_id'),
    source: (source: string) => db('alarm_sources').where({ source }).first('source', 'machine', 'alarm_id'),
    byId: (id: number) => db<AlarmRow>('alarms').where({ id }).first(),
    byIds: (ids: number[]) => db<AlarmRow>('alarms').whereIn('id', ids).orderBy('id'),
    machineOf: (row: AlarmRow) => json<AlarmMachine>(row.machine),
    events: (alarmId: number) =>
      db('alarm_events as e')
        .leftJoin('people as p', 'p.id', 'e.person_id')
        .where('e.alarm_id', alarmId)
        .orderBy('e.id')
        .select('e.at', 'e.transition', 'e.state', 'e.note', 'p.name as person'),
    attachments: (alarmId: number) =>
      db('attachments').where({ alarm_id: alarmId }).select('id', 'mime', 'bytes', 'at'),
    attachment: (id: number) => db('attachments').where({ id }).first(),
    addAttachment: (
      a: { alarm_id: number; person_id: number; file: string; mime: string; bytes: number },
      q: Knex | Knex.Transaction = db,
    ) => q('attachments').insert(a),

    /** A new alarm row for a condition that has just been raised. */
    async insertRaised(
      row: Omit<
        AlarmRow,
        | 'id'
        | 'acked_at'
        | 'acked_by'
        | 'ack_note'
        | 'cleared_at'
        | 'closed_at'
        | 'shelved_until'
        | 'shelve_reason'
        | 'escalation_level'
      >,
      /** checked in the same transaction first (among several instances: the lease is still this one's) */
      guard?: (trx: Knex.Transaction) => Promise<void>,
    ): Promise<number> {
      if (!guard) {
        const [id] = await db('alarms').insert(row);
        return id;
      }
      return db.transaction(async (trx) => {
        await guard(trx);
        const [id] = await trx('alarms').insert(row);
        return id as number;
      });
    },

    /**
     * The one write of an alarm step, in one transaction: the alarm row, one event
     * per transition, the source's machine, and whatever else belongs to the same
     * act (`also`: an acknowledgement's photo and audit entry). Returns the row as
     * written, so callers need not read it again.
     */
    async saveStep(
      s: {
        source: string;
        alarmId: number | null;
        machine: AlarmMachine;
        transitions: string[];
        state: string;
        now: Date;
        personId: number | null;
        note: string | null;
        message?: string | null;
      },
      also?: (trx: Knex.Transaction) => Promise<void>,
    ): Promise<AlarmRow | null> {
      const closed = s.transitions.includes('closed');
      const has = (t: string) => s.transitions.includes(t);
      return db.transaction(async (trx) => {
        let row: AlarmRow | null = null;
        if (s.alarmId != null) {
          const patch: Record<string, unknown> = {
            state: closed ? 'normal' : s.state,
            machine: JSON.stringify(s.machine),
            value: Number.isFinite(s.machine.value) ? s.machine.value : null,
          };
          if (s.message) patch.message = s.message.slice(0, 300);
          if (has('acknowledged')) Object.assign(patch, { acked_at: s.now, acked_by: s.personId, ack_note: s.note });
          if (has('returned')) patch.cleared_at = s.now;
          if (has('reactivated')) Object.assign(patch, { cleared_at: null, acked_at: null });
          if (has('shelved'))
            Object.assign(patch, { shelved_until: new Date(s.machine.shelvedUntilMs!), shelve_reason: s.note });
          if (has('unshelved') || has('shelf-expired')) patch.shelved_until = null;
          if (closed) Object.assign(patch, { closed_at: s.now, open_source: null });
          await trx('alarms').where({ id: s.alarmId }).update(patch);
          await trx('alarm_events').insert(
            s.transitions.map((t) => ({
              alarm_id: s.alarmId,
              at: s.now,
              transition: t,
              state: closed ? 'normal' : s.state,
              person_id: s.personId,
              note: s.note,
            })),
          );
          row = (await trx<AlarmRow>('alarms').where({ id: s.alarmId }).first()) ?? null;
        }
        await trx('alarm_sources')
          .insert({ source: s.source, machine: JSON.stringify(s.machine), alarm_id: closed ? null : s.alarmId })
          .onConflict('source')
          .merge();
        if (also) await also(trx);
        return row;
      });
    },

    /** Controllers the engine watches (not decommissioned), with their heater rating; or one, whatever its state. */
    watchedControllers: (id?: number) => {
      const q = db('controllers as c')
        .leftJoin('antennas as a', 'a.id', 'c.antenna_id')
        .select(
          'c.id',
          'c.serial',
          'c.site_id',
          'c.antenna_id',
          'c.kind',
          'c.interval_s',
          'c.last_seen_at',
          'c.decommissioned',
          'a.heater_kw',
        );
      return id == null ? q.where('c.decommissioned', false) : q.where('c.id', id);
    },

    /* notifications and escalation */
    forNotification: (alarmId: number) =>
      db('alarms as a')
        .join('sites as s', 's.id', 'a.site_id')
        .join('controllers as c', 'c.id', 'a.controller_id')
        .where('a.id', alarmId)
        .first('a.*', 's.name as site_name', 's.code as site_code', 's.time_zone', 'c.serial'),
    onCallAt: (siteId: number, level: number) =>
      db('site_on_call as o')
        .join('people as p', 'p.id', 'o.person_id')
        .where({ 'o.site_id': siteId, 'p.active': true })
        .orderBy('o.position')
        .offset(level)
        .first('p.id', 'p.email', 'p.name'),
    /** Open paging alarms unacknowledged past their site's escalation time at their level. */
    dueForEscalation: (now: Date, priorities: string[]) =>
      db('alarms as a')
        .join('sites as s', 's.id', 'a.site_id')
        .whereNull('a.closed_at')
        .whereIn('a.priority', priorities)
        .whereIn('a.state', ['unacknowledged', 'rtn-unacknowledged'])
        .whereRaw('a.raised_at < ? - INTERVAL (s.escalation_min * (a.escalation_level + 1)) MINUTE', [now])
        .select('a.id', 'a.escalation_level'),
    setEscalation: (alarmId: number, level: number) =>
      db('alarms').where({ id: alarmId }).update({ escalation_level: level }),
    list(filter: {
      states?: string[];
      siteId?: number;
      siteIds?: number[];
      priority?: string;
      open?: boolean;
      since?: Date;
      limit: number;
    }) {
      const q = db<AlarmRow>('alarms').orderBy('raised_at', 'desc').limit(filter.limit);
      if (filter.states?.length) q.whereIn('state', filter.states);
      if (filter.siteId) q.where('site_id', filter.siteId);
      if (filter.siteIds) q.whereIn('site_id', filter.siteIds);
      if (filter.priority) q.where('priority', filter.priority);
      if (filter.open) q.whereNull('closed_at');
      if (filter.since) q.where('raised_at', '>=', filter.since);
      return q;
    },
  };
}
export type AlarmsRepository = ReturnType<typeof alarmsRepository>;
