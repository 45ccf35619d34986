import { describe, expect, it } from 'vitest';

import { addToTrend, ratePerMinute } from './conditions';
import {
  countRaises,
  defaultRules,
  describeCondition,
  effectiveRule,
  type EvalContext,
  evaluateRule,
  limitSteps,
  replayRule,
  type Rule,
  rulesAt,
} from './rules';

const rules: Rule[] = defaultRules.map((r, i) => ({ ...r, id: i + 1 }));
const place = { controllerId: 7, antennaId: 3, siteId: 2 };
const ctx = (over: Partial<EvalContext> = {}): EvalContext => ({
  nowMs: 0,
  controllerKind: 'heater',
  heaterKw: 12,
  vswr: 1.1,
  forwardW: 5000,
  reflectedW: 10,
  airTempC: -2,
  heaterOn: true,
  heaterCurrentA: 50,
  batteryPct: null,
  flameProven: null,
  icing: 'none',
  recentVswr: [],
  icingEndedMs: null,
  ...over,
});

describe('rule resolution', () => {
  it('the most specific enabled rule wins: controller over antenna over site over global', () => {
    const site = { ...rules[0], id: 100, scope: 'site' as const, scopeId: 2, params: { limit: 1.4, forwardFloorW: 1 } };
    const ctl = {
      ...rules[0],
      id: 101,
      scope: 'controller' as const,
      scopeId: 7,
      params: { limit: 1.8, forwardFloorW: 1 },
    };
    expect(effectiveRule(rules, 'vswr-warning', place)?.params.limit).toBe(1.5);
    expect(effectiveRule([...rules, site], 'vswr-warning', place)?.id).toBe(100);
    expect(effectiveRule([...rules, site, ctl], 'vswr-warning', place)?.id).toBe(101);
    expect(effectiveRule([...rules, { ...site, scopeId: 9 }], 'vswr-warning', place)?.id).toBe(1);
    expect(effectiveRule([...rules, { ...ctl, enabled: false }], 'vswr-warning', place)).toBe(null);
  });

  it('seeded defaults are the site-practice figures: warning 1.5:1 high, trip 2.0:1 critical, 10 s on, 30 s off, 0.05 deadband', () => {
    const w = rules.find((r) => r.kind === 'vswr-warning')!;
    const t = rules.find((r) => r.kind === 'vswr-trip')!;
    expect([w.params.limit, w.priority, w.onDelayS, w.offDelayS, w.deadband]).toEqual([1.5, 'high', 10, 30, 0.05]);
    expect([t.params.limit, t.priority]).toEqual([2, 'critical']);
    expect(rules.find((r) => r.kind === 'silent')!.params.intervals).toBe(3);
  });
});

describe('rule conditions', () => {
  const warn = rules.find((r) => r.kind === 'vswr-warning')!;
  it('VSWR above the limit, suppressed by design while the transmitter is off', () => {
    expect(evaluateRule(warn, ctx({ vswr: 1.6 }), false)).toMatchObject({ raw: true, suppress: false });
    expect(evaluateRule(warn, ctx({ vswr: 1.6, forwardW: 0 }), false).suppress).toBe(true);
  });
  it('icing with a heater drawing under half its rating', () => {
    const r = rules.find((x) => x.kind === 'icing-heater-off')!;
    // 12 kW at 240 V is 50 A rated (P = V·I)
    expect(evaluateRule(r, ctx({ icing: 'active', heaterCurrentA: 20 }), false).raw).toBe(true);
    expect(evaluateRule(r, ctx({ icing: 'active', heaterCurrentA: 48 }), false).raw).toBe(false);
    expect(evaluateRule(r, ctx({ icing: 'active', heaterOn: false }), false).raw).toBe(true);
    expect(evaluateRule(r, ctx({ icing: 'none', heaterOn: false }), false).raw).toBe(false);
  });
  it('VSWR rising under icing conditions uses the slope over the window', () => {
    const r = rules.find((x) => x.kind === 'vswr-rising-icing')!;
    const recentVswr = Array.from({ length: 10 }, (_, i) => ({ tMs: i * 60_000, v: 1.1 + 0.05 * i }));
    expect(evaluateRule(r, ctx({ nowMs: 9 * 60_000, recentVswr, icing: 'active' }), false).raw).toBe(true);
    expect(evaluateRule(r, ctx({ nowMs: 9 * 60_000, recentVswr, icing: 'none' }), false).raw).toBe(false);
  });
  it('shedding advisory while warming within the hold time after icing', () => {
    const r = rules.find((x) => x.kind === 'shedding-advisory')!;
    expect(evaluateRule(r, ctx({ nowMs: 3_600_000, airTempC: 2, icingEndedMs: 0 }), false).raw).toBe(true);
    expect(evaluateRule(r, ctx({ nowMs: 7 * 3_600_000, airTempC: 2, icingEndedMs: 0 }), false).raw).toBe(false);
  });
});

describe('replay preview', () => {
  it('counts raises with on-delay and deadband, so a lower limit raises more', () => {
    const base = rules.find((r) => r.kind === 'vswr-warning')!;
    // two excursions of 20 s above 1.6 separated by a minute at 1.2, readings every 5 s
    const series = [
      ...Array(12).fill(1.2),
      ...Array(5).fill(1.65),
      ...Array(12).fill(1.2),
      ...Array(5).fill(1.65),
      ...Array(12).fill(1.2),
    ];
    const ctxs = series.map((v, i) => ctx({ nowMs: i * 5000, vswr: v }));
    expect(countRaises(base, ctxs)).toBe(2);
    expect(countRaises({ ...base, params: { ...base.params, limit: 1.7 } }, ctxs)).toBe(0);
    expect(countRaises({ ...base, onDelayS: 30 }, ctxs)).toBe(0);
    expect(countRaises({ ...base, params: { ...base.params, limit: 1.1 } }, ctxs)).toBe(1);
  });
});

describe('VSWR trend for rate-of-change rules', () => {
  it('keeps one point per second, the newest, and only the window', () => {
    const trend: { tMs: number; v: number }[] = [];
    for (let i = 0; i < 10; i++) addToTrend(trend, 5_000 + i * 50, 1.1 + i / 100, 60_000);
    expect(trend.length).toBe(1);
    expect(trend[0].tMs).toBe(5_450);
    expect(trend[0].v).toBeCloseTo(1.19, 12);
    for (let s = 6; s < 40 * 60; s++) addToTrend(trend, s * 1000, 1.2, 30 * 60_000);
    expect(trend.length).toBe(30 * 60 + 1);
    expect(trend[0].tMs).toBe(40 * 60_000 - 1000 - 30 * 60_000);
  });

  it('thinning a straight ramp reported five times a second leaves its slope exact', () => {
    const trend: { tMs: number; v: number }[] = [];
    // 0.02 per minute, sampled every 200 ms for 20 minutes
    for (let t = 0; t <= 20 * 60_000; t += 200) addToTrend(trend, t, 1.2 + (0.02 * t) / 60_000, 30 * 60_000);
    expect(ratePerMinute(trend, 10 * 60_000, 20 * 60_000)).toBeCloseTo(0.02, 9);
  });
});

describe('alarm wording', () => {
  it('names the value and the limit it crossed', () => {
    const warn = rules.find((r) => r.kind === 'vswr-warning')!;
    const c = ctx({ vswr: 1.734 });
    expect(describeCondition(warn, c, evaluateRule(warn, c, false))).toBe('VSWR 1.73:1 at the antenna (limit 1.5:1)');
    const heater = rules.find((r) => r.kind === 'icing-heater-off')!;
    const off = ctx({ icing: 'active', heaterOn: false });
    expect(describeCondition(heater, off, evaluateRule(heater, off, false))).toBe('Icing while the heater is off');
  });
});

describe('replay preview as spans', () => {
  it('each would-be alarm runs from the end of its on-delay to the end of its off-delay, with its worst value', () => {
    const base = rules.find((r) => r.kind === 'vswr-warning')!; // limit 1.5, on-delay 10 s, off-delay 30 s
    // readings every 5 s: 1.2 until 60 s, then 1.6, 1.7, 1.65, 1.6 (60–75 s), then 1.2 again
    const series = [...Array(12).fill(1.2), 1.6, 1.7, 1.65, 1.6, ...Array(12).fill(1.2)];
    const ctxs = series.map((v, i) => ctx({ nowMs: i * 5000, vswr: v }));
    // above from 60 s: raised once 10 s have passed (70 s); below from 80 s: returned once 30 s have passed (110 s)
    expect(replayRule(base, ctxs)).toEqual([{ fromMs: 70_000, toMs: 110_000, worst: 1.65 }]);
    // the worst value counts from the raise on; a battery rule is worse downwards
    const battery = rules.find((r) => r.kind === 'battery-low-heating')!;
    const pcts = [50, 40, 25, 20, 18, 22, 40, 45, 50, 50, 50, 50, 50, 50, 50, 50, 50, 50];
    const spans = replayRule(
      { ...battery, onDelayS: 0, offDelayS: 0 },
      pcts.map((b, i) => ctx({ nowMs: i * 60_000, batteryPct: b, heaterOn: true })),
    );
    expect(spans).toHaveLength(1);
    expect(spans[0].worst).toBe(18);
  });
});

describe('limits in force at each moment, from the rules history', () => {
  const place = { controllerId: 7, antennaId: 3, siteId: 2 };
  const global = rules.find((r) => r.kind === 'vswr-warning')!; // 1.5:1 from the seeded defaults
  const siteV1 = { ...global, id: 900, scope: 'site' as const, scopeId: 2, params: { ...global.params, limit: 1.4 } };
  const siteV2 = { ...siteV1, params: { ...siteV1.params, limit: 1.3 } };
  // 10:00 a site rule at 1.4 is made; 11:00 it is lowered to 1.3; 12:00 it is removed
  const changes = [
    { at: 10, action: 'rule.create' as const, before: null, after: siteV1 },
    { at: 11, action: 'rule.update' as const, before: siteV1, after: siteV2 },
    { at: 12, action: 'rule.delete' as const, before: siteV2, after: null },
  ];
  const now = rules; // the site rule is gone today

  it('undoes the later changes to find the rules of a past moment', () => {
    expect(rulesAt(now, changes, 9).find((r) => r.id === 900)).toBeUndefined();
    expect(rulesAt(now, changes, 10.5).find((r) => r.id === 900)?.params.limit).toBe(1.4);
    expect(rulesAt(now, changes, 11.5).find((r) => r.id === 900)?.params.limit).toBe(1.3);
    expect(rulesAt(now, changes, 13).find((r) => r.id === 900)).toBeUndefined();
  });

  it('gives a step at each change that moved a level, and none for changes elsewhere', () => {
    const elsewhere = {
      at: 10.7,
      action: 'rule.create' as const,
      before: null,
      after: { ...siteV1, id: 901, scopeId: 99 },
    };
    const steps = limitSteps(now, [...changes, elsewhere], place, 9, 13);
    expect(steps.map((s) => [s.from, s.warning])).toEqual([
      [9, 1.5],
      [10, 1.4],
      [11, 1.3],
      [12, 1.5],
    ]);
    expect(new Set(steps.map((s) => s.trip))).toEqual(new Set([2]));
  });
});
