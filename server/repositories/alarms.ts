import type { Knex } from 'knex';

import type { AlarmMachine, Priority } from '../../telemetry/alarms/machine';
import type { Rule, RuleKind } from '../../telemetry/alarms/rules';

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
});

export function alarmsRepository(db: Knex) {
  return {
    rules: async () => (await db('alarm_rules').orderBy('id')).map(toRule),
    rule: async (id: number) => {
      const r = await db('alarm_rules').where({ id }).first();
      return r ? toRule(r) : null;
    },
    sources: () => db('alarm_sources').select('source', 'machine', 'alarm_id'),
    byId: (id: number) => db<AlarmRow>('alarms').where({ id }).first(),
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
    addAttachment: (a: { alarm_id: number; person_id: number; file: string; mime: string; bytes: number }) =>
      db('attachments').insert(a),
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
