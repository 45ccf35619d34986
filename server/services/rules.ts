import type { Knex } from 'knex';

import { AppError, notFound } from '@/server/errors';
import { alarmsRepository } from '@/server/repositories/alarms';
import type { auditRepository } from '@/server/repositories/people';
import {
  checkParams,
  effectiveRule,
  type EvalContext,
  evaluateRule,
  replayRule,
  type ReplaySpan,
  type Rule,
  type RuleBody,
  type RuleKind,
  ruleKinds,
  ruleLevel,
  type RuleScope,
} from '@/telemetry/alarms/rules';
import type { Person } from '@/telemetry/api';
import { classifyIcing } from '@/telemetry/math/icing';

import type { ScopeGuard } from './scope';

const maxPreviewRows = 400_000;
/** The replayed trace is drawn at most this many columns wide. */
const previewColumns = 800;

const spanOut = (x: ReplaySpan) => ({
  from: new Date(x.fromMs).toISOString(),
  to: x.toMs == null ? null : new Date(x.toMs).toISOString(),
  worst: x.worst,
});

/** The watched value per time column: its least and greatest, so neither a spike nor a dip is lost. */
function previewTrace(
  ctxs: EvalContext[],
  value: (c: EvalContext) => number | null,
  from: number,
  to: number,
  columns: number,
) {
  const width = Math.max(1, (to - from) / columns);
  const cols = new Map<number, { ts: string; min: number; max: number }>();
  for (const c of ctxs) {
    const v = value(c);
    if (v == null || !Number.isFinite(v)) continue;
    const k = Math.floor((c.nowMs - from) / width);
    const col = cols.get(k);
    if (!col) cols.set(k, { ts: new Date(from + k * width).toISOString(), min: v, max: v });
    else {
      col.min = Math.min(col.min, v);
      col.max = Math.max(col.max, v);
    }
  }
  return [...cols.values()];
}

export function rulesService(deps: {
  db: Knex;
  audit: ReturnType<typeof auditRepository>;
  guard: ScopeGuard;
  changed: () => Promise<void>;
}) {
  const repo = alarmsRepository(deps.db);

  function validated(kind: RuleKind, body: RuleBody) {
    const p = checkParams(kind, body.params);
    if (!p.success)
      throw new AppError(
        'bad_request',
        'The rule parameters are not valid',
        p.error.issues.map((i) => ({ path: `params.${i.path.join('.')}`, message: i.message })),
      );
    return p.data as Record<string, number>;
  }

  const toRow = (body: RuleBody, params: Record<string, number>) => ({
    enabled: body.enabled,
    priority: body.priority,
    params: JSON.stringify(params),
    on_delay_s: body.onDelayS,
    off_delay_s: body.offDelayS,
    deadband: body.deadband,
    ...(body.guidance !== undefined ? { guidance: body.guidance || null } : {}),
    updated_at: new Date(),
  });

  async function place(controllerId: number) {
    const c = await deps.db('controllers').where({ id: controllerId }).first('id', 'site_id', 'antenna_id');
    if (!c) throw notFound('Controller');
    return { controllerId: c.id, antennaId: c.antenna_id, siteId: c.site_id };
  }

  /** Stored readings as evaluation contexts: raw for a day, minute maxima for longer spans. */
  async function contexts(controllerId: number, days: number): Promise<EvalContext[]> {
    const since = new Date(Date.now() - days * 86_400_000);
    const c = await deps
      .db('controllers as c')
      .leftJoin('antennas as a', 'a.id', 'c.antenna_id')
      .where('c.id', controllerId)
      .first('c.kind', 'a.heater_kw');
    const rows =
      days <= 1
        ? await deps
            .db('readings')
            .where('controller_id', controllerId)
            .andWhere('ts', '>=', since)
            .orderBy('ts')
            .limit(maxPreviewRows)
            .select(
              'ts',
              'vswr',
              'forward_w',
              'reflected_w',
              'air_temp_c',
              'humidity_pct',
              'moisture',
              'heater_on',
              'heater_current_a',
              'battery_pct',
              'flame_proven',
            )
        : await deps
            .db('rollups_minute')
            .where('controller_id', controllerId)
            .andWhere('minute', '>=', since)
            .orderBy('minute')
            .select(
              'minute as ts',
              'vswr_max as vswr',
              deps.db.raw('forward_w_sum / NULLIF(forward_w_n, 0) AS forward_w'),
              'reflected_w_max as reflected_w',
              deps.db.raw('air_temp_c_sum / NULLIF(air_temp_c_n, 0) AS air_temp_c'),
              deps.db.raw('humidity_pct_sum / NULLIF(humidity_pct_n, 0) AS humidity_pct'),
              deps.db.raw('moisture_n > 0 AS moisture'),
              deps.db.raw('heater_on_n * 2 >= n AS heater_on'),
              deps.db.raw('NULL AS heater_current_a'),
              deps.db.raw('NULL AS battery_pct'),
              deps.db.raw('NULL AS flame_proven'),
            );
    const recent: { tMs: number; v: number }[] = [];
    return rows.map((r) => {
      const tMs = new Date(r.ts).getTime();
      if (r.vswr != null) recent.push({ tMs, v: Number(r.vswr) });
      while (recent.length && recent[0].tMs < tMs - 30 * 60_000) recent.shift();
      const airTempC = Number(r.air_temp_c);
      return {
        nowMs: tMs,
        controllerKind: c?.kind ?? 'heater',
        heaterKw: c?.heater_kw ?? null,
        vswr: r.vswr == null ? null : Number(r.vswr),
        forwardW: Number(r.forward_w ?? 0),
        reflectedW: Number(r.reflected_w ?? 0),
        airTempC,
        heaterOn: Boolean(Number(r.heater_on)),
        heaterCurrentA: r.heater_current_a == null ? null : Number(r.heater_current_a),
        batteryPct: r.battery_pct == null ? null : Number(r.battery_pct),
        flameProven: r.flame_proven == null ? null : Boolean(r.flame_proven),
        icing: classifyIcing({
          airTempC,
          humidityPct: r.humidity_pct == null ? null : Number(r.humidity_pct),
          moisture: r.moisture == null ? null : Boolean(Number(r.moisture)),
        }).state,
        recentVswr: [...recent],
        icingEndedMs: null,
      };
    });
  }

  return {
    list: () => repo.rules(),

    /** Each kind's effective rule for a controller, and the scope it comes from. */
    async effective(actor: Person, controllerId: number) {
      await deps.guard.controller(actor, controllerId);
      const rules = await repo.rules();
      const p = await place(controllerId);
      return ruleKinds.map((kind) => ({ kind, rule: effectiveRule(rules, kind, p) }));
    },

    async update(actor: Person, id: number, body: RuleBody): Promise<Rule> {
      const before = await repo.rule(id);
      if (!before) throw notFound('Rule');
      const params = validated(before.kind, body);
      await deps.db('alarm_rules').where({ id }).update(toRow(body, params));
      const after = (await repo.rule(id))!;
      await deps.audit.record({ personId: actor.id, action: 'rule.update', subject: `rule:${id}`, before, after });
      await deps.changed();
      return after;
    },

    async createOverride(
      actor: Person,
      kind: RuleKind,
      scope: Exclude<RuleScope, 'global'>,
      scopeId: number,
      body: RuleBody,
    ): Promise<Rule> {
      const table = { site: 'sites', antenna: 'antennas', controller: 'controllers' }[scope];
      if (!(await deps.db(table).where({ id: scopeId }).first())) throw new AppError('bad_request', `No such ${scope}`);
      if (await deps.db('alarm_rules').where({ kind, scope, scope_id: scopeId }).first())
        throw new AppError('conflict', 'That scope already has its own rule of this kind; edit it instead');
      const params = validated(kind, body);
      const [id] = await deps.db('alarm_rules').insert({ kind, scope, scope_id: scopeId, ...toRow(body, params) });
      const after = (await repo.rule(id))!;
      await deps.audit.record({ personId: actor.id, action: 'rule.create', subject: `rule:${id}`, after });
      await deps.changed();
      return after;
    },

    async remove(actor: Person, id: number) {
      const before = await repo.rule(id);
      if (!before) throw notFound('Rule');
      if (before.scope === 'global')
        throw new AppError('bad_request', 'Global rules can be changed or disabled, not removed');
      await deps.db('alarm_rules').where({ id }).delete();
      await deps.audit.record({ personId: actor.id, action: 'rule.delete', subject: `rule:${id}`, before });
      await deps.changed();
    },

    /**
     * What the rule in force and the proposed settings would have raised at a controller
     * over stored readings: each alarm as a span, the value the rule watches as a trace
     * (min and max per column, so no peak is lost) and the level each draws.
     */
    async preview(controllerId: number, kind: RuleKind, body: RuleBody, days: number) {
      if (kind === 'silent')
        throw new AppError('bad_request', 'Silence depends on arrival times; it has no replay preview');
      const params = validated(kind, body);
      const rules = await repo.rules();
      const current = effectiveRule(rules, kind, await place(controllerId));
      const proposed: Rule = { id: 0, kind, scope: 'controller', scopeId: controllerId, ...body, params };
      const ctxs = await contexts(controllerId, days);
      const currentSpans = current ? replayRule(current, ctxs) : [];
      const proposedSpans = body.enabled ? replayRule(proposed, ctxs) : [];
      const level = ruleLevel[kind];
      const to = Date.now();
      const from = to - days * 86_400_000;
      return {
        days,
        readings: ctxs.length,
        basis: days <= 1 ? 'raw readings' : 'minute maxima from rollups',
        from: new Date(from).toISOString(),
        to: new Date(to).toISOString(),
        current: currentSpans.length,
        proposed: proposedSpans.length,
        levels: {
          current: level && current ? (current.params[level.param] ?? null) : null,
          proposed: level ? (params[level.param] ?? null) : null,
        },
        trace: previewTrace(ctxs, (c) => evaluateRule(proposed, c, false).value, from, to, previewColumns),
        spans: {
          current: currentSpans.map(spanOut),
          proposed: proposedSpans.map(spanOut),
        },
      };
    },
  };
}
export type RulesService = ReturnType<typeof rulesService>;
