import { z } from 'zod';

import type { IcingState } from '@/telemetry/math/icing';

import { ratePerMinute, thresholdCondition } from './conditions';
import { type AlarmMachine, idleMachine, priorities, type Priority, stepAlarm } from './machine';

/** Alarm rule kinds, their tunable parameters and how each turns a reading into a condition. */
export const ruleKinds = [
  'vswr-warning',
  'vswr-trip',
  'reflected-high',
  'vswr-rising-icing',
  'icing-heater-off',
  'flame-not-proven',
  'silent',
  'battery-low-heating',
  'shedding-advisory',
] as const;
export type RuleKind = (typeof ruleKinds)[number];

const floor = z.number().min(0).max(100_000);
export const ruleParamsSchemas = {
  'vswr-warning': z.object({ limit: z.number().min(1.01).max(20), forwardFloorW: floor }),
  'vswr-trip': z.object({ limit: z.number().min(1.01).max(20), forwardFloorW: floor }),
  'reflected-high': z.object({ limitW: z.number().positive().max(1_000_000), forwardFloorW: floor }),
  'vswr-rising-icing': z.object({
    risePerMin: z.number().positive().max(10),
    windowMin: z.number().min(1).max(120),
    forwardFloorW: floor,
  }),
  'icing-heater-off': z.object({
    minCurrentFraction: z.number().min(0).max(1),
    volts: z.number().positive().max(1000),
  }),
  'flame-not-proven': z.object({}),
  silent: z.object({ intervals: z.number().int().min(1).max(1000) }),
  'battery-low-heating': z.object({ limitPct: z.number().min(0).max(100) }),
  'shedding-advisory': z.object({ aboveC: z.number().min(-5).max(10), holdHours: z.number().min(0.5).max(72) }),
} as const satisfies Record<RuleKind, z.ZodType>;

export const ruleLabels: Record<RuleKind, string> = {
  'vswr-warning': 'VSWR warning level',
  'vswr-trip': 'VSWR trip level',
  'reflected-high': 'Reflected power high',
  'vswr-rising-icing': 'VSWR rising under icing conditions',
  'icing-heater-off': 'Icing while the heater is off or draws too little',
  'flame-not-proven': 'Gas heater flame not proven',
  silent: 'Controller silent',
  'battery-low-heating': 'Battery low while heating',
  'shedding-advisory': 'Ice-shedding advisory',
};

export const ruleScopes = ['global', 'site', 'antenna', 'controller'] as const;
export type RuleScope = (typeof ruleScopes)[number];

export type Rule = {
  id: number;
  kind: RuleKind;
  scope: RuleScope;
  scopeId: number | null;
  enabled: boolean;
  priority: Priority;
  params: Record<string, number>;
  onDelayS: number;
  offDelayS: number;
  deadband: number;
  /** what to do when this rule's alarm comes, in the engineer's words */
  guidance?: string | null;
};

export const ruleBodySchema = z.object({
  enabled: z.boolean(),
  priority: z.enum(priorities),
  params: z.record(z.string(), z.number()),
  onDelayS: z.number().int().min(0).max(3600),
  offDelayS: z.number().int().min(0).max(3600),
  deadband: z.number().min(0).max(1000),
  /** left out: kept as it is; empty: removed */
  guidance: z.string().trim().max(2000, 'At most 2,000 characters').nullable().optional(),
});
export type RuleBody = z.infer<typeof ruleBodySchema>;

export function checkParams(kind: RuleKind, params: unknown) {
  return ruleParamsSchemas[kind].safeParse(params);
}

/** Seeded global defaults: site practice, not a standard, and meant to be tuned. */
export const defaultRules: Omit<Rule, 'id'>[] = [
  {
    kind: 'vswr-warning',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'high',
    params: { limit: 1.5, forwardFloorW: 1 },
    onDelayS: 10,
    offDelayS: 30,
    deadband: 0.05,
  },
  {
    kind: 'vswr-trip',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'critical',
    params: { limit: 2.0, forwardFloorW: 1 },
    onDelayS: 10,
    offDelayS: 30,
    deadband: 0.05,
  },
  {
    kind: 'reflected-high',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'high',
    params: { limitW: 1000, forwardFloorW: 1 },
    onDelayS: 10,
    offDelayS: 30,
    deadband: 20,
  },
  {
    kind: 'vswr-rising-icing',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'medium',
    params: { risePerMin: 0.02, windowMin: 10, forwardFloorW: 1 },
    onDelayS: 30,
    offDelayS: 120,
    deadband: 0,
  },
  {
    kind: 'icing-heater-off',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'high',
    params: { minCurrentFraction: 0.5, volts: 240 },
    onDelayS: 60,
    offDelayS: 60,
    deadband: 0,
  },
  {
    kind: 'flame-not-proven',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'high',
    params: {},
    onDelayS: 30,
    offDelayS: 30,
    deadband: 0,
  },
  {
    kind: 'silent',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'high',
    params: { intervals: 3 },
    onDelayS: 0,
    offDelayS: 0,
    deadband: 0,
  },
  {
    kind: 'battery-low-heating',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'medium',
    params: { limitPct: 30 },
    onDelayS: 60,
    offDelayS: 60,
    deadband: 2,
  },
  {
    kind: 'shedding-advisory',
    scope: 'global',
    scopeId: null,
    enabled: true,
    priority: 'low',
    params: { aboveC: 0.5, holdHours: 6 },
    onDelayS: 60,
    offDelayS: 0,
    deadband: 0,
  },
];

export type Place = { controllerId: number; antennaId: number | null; siteId: number };

const rank: Record<RuleScope, number> = { controller: 4, antenna: 3, site: 2, global: 1 };

/** The most specific rule of a kind that applies to a place; a disabled specific rule switches the kind off there. */
export function effectiveRule(rules: Rule[], kind: RuleKind, place: Place): Rule | null {
  const applies = (r: Rule) =>
    r.kind === kind &&
    (r.scope === 'global' ||
      (r.scope === 'site' && r.scopeId === place.siteId) ||
      (r.scope === 'antenna' && r.scopeId === place.antennaId) ||
      (r.scope === 'controller' && r.scopeId === place.controllerId));
  const best = rules.filter(applies).sort((a, b) => rank[b.scope] - rank[a.scope])[0];
  return best && best.enabled ? best : null;
}

export type EvalContext = {
  nowMs: number;
  controllerKind: string;
  heaterKw: number | null;
  vswr: number | null;
  forwardW: number;
  reflectedW: number;
  airTempC: number;
  heaterOn: boolean;
  heaterCurrentA: number | null;
  batteryPct: number | null;
  flameProven: boolean | null;
  icing: IcingState;
  recentVswr: { tMs: number; v: number }[];
  /** when the last icing episode at this controller ended, if one did */
  icingEndedMs: number | null;
};

export type Evaluation = { raw: boolean | null; value: number | null; suppress: boolean };

/** A rule's condition for one reading; `active` is the debounced state, for deadbands. */
export function evaluateRule(rule: Rule, ctx: EvalContext, active: boolean): Evaluation {
  const p = rule.params;
  const txOff = ctx.forwardW < (p.forwardFloorW ?? 0);
  switch (rule.kind) {
    case 'vswr-warning':
    case 'vswr-trip':
      return {
        raw: thresholdCondition(ctx.vswr, p.limit, 'above', rule.deadband, active),
        value: ctx.vswr,
        suppress: txOff,
      };
    case 'reflected-high':
      return {
        raw: thresholdCondition(ctx.reflectedW, p.limitW, 'above', rule.deadband, active),
        value: ctx.reflectedW,
        suppress: txOff,
      };
    case 'vswr-rising-icing': {
      const rate = ratePerMinute(ctx.recentVswr, p.windowMin * 60_000, ctx.nowMs);
      const icing = ctx.icing === 'likely' || ctx.icing === 'active';
      return { raw: rate == null ? null : icing && rate > p.risePerMin, value: rate, suppress: txOff };
    }
    case 'icing-heater-off': {
      if (ctx.controllerKind === 'radome-sensor' || ctx.controllerKind === 'gas-heater')
        return { raw: false, value: null, suppress: false };
      const ratedA = ratedCurrentA(ctx, p.volts);
      const low =
        !ctx.heaterOn ||
        (ratedA != null && ctx.heaterCurrentA != null && ctx.heaterCurrentA < ratedA * p.minCurrentFraction);
      return { raw: ctx.icing === 'active' && low, value: ctx.heaterCurrentA, suppress: false };
    }
    case 'flame-not-proven':
      if (ctx.controllerKind !== 'gas-heater') return { raw: false, value: null, suppress: false };
      return { raw: ctx.heaterOn && ctx.flameProven === false, value: null, suppress: false };
    case 'battery-low-heating':
      return {
        raw:
          ctx.batteryPct == null
            ? false
            : thresholdCondition(ctx.batteryPct, p.limitPct, 'below', rule.deadband, active)! && ctx.heaterOn,
        value: ctx.batteryPct,
        suppress: false,
      };
    case 'shedding-advisory': {
      const recent = ctx.icingEndedMs != null && ctx.nowMs - ctx.icingEndedMs < p.holdHours * 3_600_000;
      return { raw: recent && ctx.airTempC > p.aboveC, value: ctx.airTempC, suppress: false };
    }
    case 'silent':
      return { raw: null, value: null, suppress: false };
  }
}

const ratedCurrentA = (ctx: EvalContext, volts: number) => (ctx.heaterKw ? (ctx.heaterKw * 1000) / volts : null);

/**
 * The words an alarm row carries for a rule's condition at one reading. Kept apart
 * from evaluateRule so that the per-reading path formats nothing; called on changes only.
 */
export function describeCondition(rule: Rule, ctx: EvalContext, e: Evaluation): string {
  const p = rule.params;
  switch (rule.kind) {
    case 'vswr-warning':
    case 'vswr-trip':
      return `VSWR ${ctx.vswr?.toFixed(2) ?? '–'}:1 at the antenna (limit ${p.limit}:1)`;
    case 'reflected-high':
      return `Reflected ${ctx.reflectedW.toFixed(0)} W at the coupler (limit ${p.limitW} W)`;
    case 'vswr-rising-icing':
      return `VSWR at the antenna rising ${e.value?.toFixed(3) ?? '–'} per minute while icing is ${ctx.icing}`;
    case 'icing-heater-off':
      if (ctx.controllerKind === 'radome-sensor' || ctx.controllerKind === 'gas-heater') return '';
      return ctx.heaterOn
        ? `Icing; heater draws ${ctx.heaterCurrentA ?? 0} A of ${ratedCurrentA(ctx, p.volts)?.toFixed(1)} A rated`
        : 'Icing while the heater is off';
    case 'flame-not-proven':
      return ctx.controllerKind === 'gas-heater' ? 'Calling for heat but the flame is not proven' : '';
    case 'battery-low-heating':
      return `Battery ${ctx.batteryPct?.toFixed(0) ?? '–'} % while heating`;
    case 'shedding-advisory':
      return `Warming to ${ctx.airTempC.toFixed(1)} °C after icing: ice may shed`;
    case 'silent':
      return '';
  }
}

/** One alarm a replay would have raised: when, until when (null: still active at the end), and its worst value. */
export type ReplaySpan = { fromMs: number; toMs: number | null; worst: number | null };

/** Which of a rule's settings is the level drawn on a replayed trace, and which way is worse. */
export const ruleLevel: Partial<Record<RuleKind, { param: string; worse: 'above' | 'below' }>> = {
  'vswr-warning': { param: 'limit', worse: 'above' },
  'vswr-trip': { param: 'limit', worse: 'above' },
  'reflected-high': { param: 'limitW', worse: 'above' },
  'vswr-rising-icing': { param: 'risePerMin', worse: 'above' },
  'battery-low-heating': { param: 'limitPct', worse: 'below' },
  'shedding-advisory': { param: 'aboveC', worse: 'above' },
};

/**
 * Replays stored readings through a rule: each alarm it would have raised, from its
 * raising to its return (with on- and off-delays and deadband as the engine applies
 * them), and the worst value while it was up.
 */
export function replayRule(rule: Rule, contexts: EvalContext[]): ReplaySpan[] {
  let m: AlarmMachine = idleMachine;
  const spans: ReplaySpan[] = [];
  let open: ReplaySpan | null = null;
  const below = ruleLevel[rule.kind]?.worse === 'below';
  const timing = { onDelayMs: rule.onDelayS * 1000, offDelayMs: rule.offDelayS * 1000 };
  for (const ctx of contexts) {
    const e = evaluateRule(rule, ctx, m.active);
    const s = stepAlarm(m, { nowMs: ctx.nowMs, raw: e.raw, suppress: e.suppress }, timing);
    // in a replay nobody is there to acknowledge: take each alarm as acknowledged once raised
    m =
      s.transitions.includes('raised') || s.transitions.includes('reactivated')
        ? { ...s.machine, acked: true }
        : s.machine;
    if (s.transitions.includes('raised')) {
      open = { fromMs: ctx.nowMs, toMs: null, worst: null };
      spans.push(open);
    }
    if (open && e.value != null && (open.worst == null || (below ? e.value < open.worst : e.value > open.worst)))
      open.worst = e.value;
    if (open && (s.transitions.includes('returned') || s.transitions.includes('closed'))) {
      open.toMs = ctx.nowMs;
      open = null;
    }
  }
  return spans;
}

/** How many alarms a replay of stored readings would have raised. */
export const countRaises = (rule: Rule, contexts: EvalContext[]): number => replayRule(rule, contexts).length;

/** The priority a kind of rule raises at unless an engineer has changed it. */
export const defaultPriority = (kind: RuleKind): Priority =>
  defaultRules.find((r) => r.kind === kind)?.priority ?? 'low';

/** One change to the rules as the audit log keeps it. */
export type RuleChange = {
  at: number;
  action: 'rule.create' | 'rule.update' | 'rule.delete';
  before: Rule | null;
  after: Rule | null;
};

/** The rules as they stood at `at`: today's list with every later change undone, newest first. */
export function rulesAt(now: Rule[], changes: RuleChange[], at: number): Rule[] {
  let list = [...now];
  for (const ch of [...changes].filter((c) => c.at > at).sort((a, b) => b.at - a.at)) {
    const id = (ch.after ?? ch.before)?.id;
    if (id == null) continue;
    list = list.filter((r) => r.id !== id);
    if (ch.action !== 'rule.create' && ch.before) list.push(ch.before);
  }
  return list;
}

export type LimitStep = { from: number; warning: number | null; trip: number | null };

/**
 * The VSWR warning and trip levels in force at a place across a span, as steps: the
 * first at `from`, then one at each rule change that moved either level.
 */
export function limitSteps(
  now: Rule[],
  changes: RuleChange[],
  place: Parameters<typeof effectiveRule>[2],
  from: number,
  to: number,
): LimitStep[] {
  const at = (t: number): LimitStep => {
    const rules = rulesAt(now, changes, t);
    return {
      from: t,
      warning: effectiveRule(rules, 'vswr-warning', place)?.params.limit ?? null,
      trip: effectiveRule(rules, 'vswr-trip', place)?.params.limit ?? null,
    };
  };
  const steps = [at(from)];
  for (const t of [...new Set(changes.map((c) => c.at))].filter((t) => t > from && t <= to).sort((a, b) => a - b)) {
    const s = at(t);
    const last = steps[steps.length - 1];
    if (s.warning !== last.warning || s.trip !== last.trip) steps.push(s);
  }
  return steps;
}
