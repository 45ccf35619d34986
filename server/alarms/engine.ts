import { EventEmitter } from 'node:events';

import type { Knex } from 'knex';
import type { Logger } from 'pino';

import type { AcceptedReading } from '@/server/ingest/ingest';
import { type AlarmRow, alarmsRepository } from '@/server/repositories/alarms';
import { addToTrend, silentCondition } from '@/telemetry/alarms/conditions';
import {
  acknowledge,
  type AlarmMachine,
  idleMachine,
  isaState,
  type Priority,
  setOutOfService,
  shelve,
  type Step,
  stepAlarm,
  tickAlarm,
  unshelve,
} from '@/telemetry/alarms/machine';
import {
  describeCondition,
  effectiveRule,
  type EvalContext,
  evaluateRule,
  type Evaluation,
  type Rule,
  type RuleKind,
  ruleKinds,
} from '@/telemetry/alarms/rules';
import { classifyIcing } from '@/telemetry/math/icing';

type Meta = {
  id: number;
  serial: string;
  siteId: number;
  antennaId: number | null;
  kind: string;
  intervalS: number;
  heaterKw: number | null;
  lastSeenMs: number | null;
  recent: { tMs: number; v: number }[];
  wasIcing: boolean;
  icingEndedMs: number | null;
  /** the reading-driven rules in force for this controller, worked out once per rule or controller change */
  inForce?: { rule: Rule; source: string }[];
};
type SourceState = { machine: AlarmMachine; alarmId: number | null };
export type AlarmChange = {
  alarmId: number;
  siteId: number;
  controllerId: number;
  state: string;
  transitions: string[];
  priority: string;
  kind: RuleKind | 'heater-forced-off';
  message: string;
};

const recentWindowMs = 30 * 60_000;

/** Sources are named "<kind>:<controller id>". */
const controllerOf = (source: string) => Number(source.slice(source.lastIndexOf(':') + 1));
const json = <T = AlarmMachine>(v: unknown): T => (typeof v === 'string' ? JSON.parse(v) : v) as T;

/**
 * Runs the pure rule evaluation and alarm state machine on every accepted reading
 * and on a clock (silence, shelf expiry). State lives in MariaDB (alarm_sources,
 * alarms, alarm_events), written in one transaction per transition, so a restart
 * neither loses nor duplicates an alarm. One source's work is serialised.
 */
export class AlarmEngine extends EventEmitter<{
  change: [AlarmChange];
  /** a person stepped an alarm source (acknowledged, shelved…): among several instances, its owner reads it again */
  acted: [source: string];
}> {
  private rules: Rule[] = [];
  private meta = new Map<number, Meta>();
  private sources = new Map<string, SourceState>();
  private chains = new Map<string, Promise<unknown>>();
  private timer: NodeJS.Timeout | null = null;
  private repo;
  /**
   * Among several instances: which controllers are this one's, and the fence check
   * that every automatic write makes in its transaction (a person's action may come
   * through any instance). Unset: one instance, everything is its own.
   */
  cluster: {
    owns: (controllerId: number) => boolean;
    fence: (trx: Knex.Transaction, controllerId: number) => Promise<void>;
  } | null = null;

  constructor(
    private db: Knex,
    private log: Logger,
    private clock: () => number = Date.now,
  ) {
    super();
    this.repo = alarmsRepository(db);
  }

  async start(tickMs = 1000) {
    await this.reloadRules();
    const ctls = await this.repo.watchedControllers();
    for (const c of ctls) this.meta.set(c.id, this.toMeta(c));
    for (const s of await this.repo.sources())
      this.sources.set(s.source, {
        machine: typeof s.machine === 'string' ? JSON.parse(s.machine) : s.machine,
        alarmId: s.alarm_id,
      });
    this.timer = setInterval(() => void this.tick(), tickMs);
  }

  private fenceFor(source: string) {
    const c = this.cluster;
    return c ? (trx: Knex.Transaction) => c.fence(trx, controllerOf(source)) : undefined;
  }

  /**
   * Controllers this instance has just taken over: their details and alarm sources
   * read again from MariaDB, where the former owner left them.
   */
  async adopt(controllerIds: number[]) {
    for (const id of controllerIds) await this.reloadController(id);
    for (let i = 0; i < controllerIds.length; i += 500)
      for (const s of await this.repo.sourcesOf(controllerIds.slice(i, i + 500)))
        await this.serial(s.source, async () => {
          this.sources.set(s.source, { machine: json(s.machine), alarmId: s.alarm_id });
        });
  }

  /** One alarm source read again (another instance stepped it: a person's act through it). */
  async reloadSource(source: string) {
    await this.serial(source, async () => {
      const s = await this.repo.source(source);
      if (s) this.sources.set(source, { machine: json(s.machine), alarmId: s.alarm_id });
      else this.sources.delete(source);
    });
  }

  stop() {
    if (this.timer) clearInterval(this.timer);
    return Promise.allSettled([...this.chains.values()]);
  }

  async reloadRules() {
    this.rules = await this.repo.rules();
    for (const m of this.meta.values()) m.inForce = undefined;
  }

  async reloadController(id: number) {
    const c = (await this.repo.watchedControllers(id))[0];
    if (!c || c.decommissioned) this.meta.delete(id);
    else this.meta.set(id, { ...this.toMeta(c), ...pick(this.meta.get(id)) });
  }

  private toMeta(c: Record<string, unknown>): Meta {
    return {
      id: c.id as number,
      serial: c.serial as string,
      siteId: c.site_id as number,
      antennaId: (c.antenna_id as number) ?? null,
      kind: c.kind as string,
      intervalS: c.interval_s as number,
      heaterKw: (c.heater_kw as number) ?? null,
      lastSeenMs: c.last_seen_at ? new Date(c.last_seen_at as string).getTime() : null,
      recent: [],
      wasIcing: false,
      icingEndedMs: null,
    };
  }

  /** Runs one source's work after what is already queued for it; the queue entry goes once drained. */
  private serial<T>(source: string, work: () => Promise<T>): Promise<T> {
    const next = (this.chains.get(source) ?? Promise.resolve()).then(work, work);
    const tail: Promise<unknown> = next.then(
      () => {
        if (this.chains.get(source) === tail) this.chains.delete(source);
      },
      () => {
        if (this.chains.get(source) === tail) this.chains.delete(source);
      },
    );
    this.chains.set(source, tail);
    return next;
  }

  /**
   * One reading through every rule in force for its controller. The usual reading
   * changes no alarm: then nothing is awaited and no promise is made (undefined).
   */
  onReading(r: AcceptedReading): Promise<unknown> | undefined {
    const m = this.meta.get(r.controllerId);
    if (m) return this.step(m, r);
    return this.reloadController(r.controllerId).then(() => {
      const loaded = this.meta.get(r.controllerId);
      return loaded ? this.step(loaded, r) : undefined;
    });
  }

  private step(m: Meta, r: AcceptedReading): Promise<unknown> | undefined {
    const now = Date.parse(r.reading.ts) || this.clock();
    m.lastSeenMs = Math.max(m.lastSeenMs ?? 0, this.clock());
    if (r.vswr != null) addToTrend(m.recent, now, r.vswr, recentWindowMs);
    const icing = classifyIcing({
      airTempC: r.reading.airTempC,
      humidityPct: r.reading.humidityPct,
      moisture: r.reading.moisture,
    }).state;
    if (icing === 'active') m.wasIcing = true;
    else if (m.wasIcing && icing === 'none') {
      m.wasIcing = false;
      m.icingEndedMs = now;
    }
    const ctx = {
      nowMs: now,
      controllerKind: m.kind,
      heaterKw: m.heaterKw,
      vswr: r.vswr,
      forwardW: r.forwardW,
      reflectedW: r.reflectedW,
      airTempC: r.reading.airTempC,
      heaterOn: r.reading.heater.on,
      heaterCurrentA: r.reading.heater.currentA,
      batteryPct: r.reading.supply.batteryPct,
      flameProven: r.reading.flameProven,
      icing,
      recentVswr: m.recent,
      icingEndedMs: m.icingEndedMs,
    };
    const meta = m;
    const work: Promise<unknown>[] = [];
    m.inForce ??= this.inForce(m);
    for (const { rule, source } of m.inForce) {
      if (this.chains.has(source)) {
        // earlier work on this source is still being written: evaluate after it, on the state it leaves
        work.push(
          this.serial(source, () => this.applyEvaluation(source, meta, rule, ctx, this.evaluate(source, rule, ctx))),
        );
        continue;
      }
      // the usual case, a step with no transition, costs no promise and no I/O
      const r = this.evaluate(source, rule, ctx);
      if (r.step.transitions.length)
        work.push(this.serial(source, () => this.applyEvaluation(source, meta, rule, ctx, r)));
      else if (r.step.machine !== r.st.machine) this.sources.set(source, { ...r.st, machine: r.step.machine });
    }
    return work.length ? Promise.all(work) : undefined;
  }

  /** One rule's condition and state-machine step for one reading, on the source's current state. */
  private evaluate(source: string, rule: Rule, ctx: EvalContext) {
    const st = this.sources.get(source) ?? { machine: idleMachine, alarmId: null };
    const e = evaluateRule(rule, ctx, st.machine.active);
    const step = stepAlarm(
      st.machine,
      { nowMs: ctx.nowMs, raw: e.raw, suppress: e.suppress, value: e.value },
      { onDelayMs: rule.onDelayS * 1000, offDelayMs: rule.offDelayS * 1000 },
    );
    return { st, step, e };
  }

  private applyEvaluation(
    source: string,
    m: Meta,
    rule: Rule,
    ctx: EvalContext,
    r: ReturnType<AlarmEngine['evaluate']>,
  ) {
    return this.apply(source, m, origin(rule), r.st, r.step, r.e, () => describeCondition(rule, ctx, r.e), ctx.nowMs);
  }

  private inForce(m: Meta) {
    const place = { controllerId: m.id, antennaId: m.antennaId, siteId: m.siteId };
    return ruleKinds.flatMap((kind) => {
      const rule = kind === 'silent' ? null : effectiveRule(this.rules, kind, place);
      return rule ? [{ rule, source: `${kind}:${m.id}` }] : [];
    });
  }

  /** Clock: silence per controller and shelf expiries. */
  async tick(now = this.clock()) {
    const work: Promise<unknown>[] = [];
    for (const m of this.meta.values()) {
      if (this.cluster && !this.cluster.owns(m.id)) continue;
      const rule = effectiveRule(this.rules, 'silent', {
        controllerId: m.id,
        antennaId: m.antennaId,
        siteId: m.siteId,
      });
      if (!rule) continue;
      const source = `silent:${m.id}`;
      work.push(
        this.serial(source, async () => {
          const st = this.sources.get(source) ?? { machine: idleMachine, alarmId: null };
          const raw = silentCondition(m.lastSeenMs, now, m.intervalS * 1000, rule.params.intervals);
          const silentS = m.lastSeenMs ? Math.round((now - m.lastSeenMs) / 1000) : null;
          const e: Evaluation = { raw, value: silentS, suppress: false };
          const step = stepAlarm(
            st.machine,
            { nowMs: now, raw, value: silentS },
            { onDelayMs: rule.onDelayS * 1000, offDelayMs: rule.offDelayS * 1000 },
          );
          await this.apply(
            source,
            m,
            origin(rule),
            st,
            step,
            e,
            () => `No telemetry for ${silentS ?? '?'} s (${rule.params.intervals} intervals of ${m.intervalS} s)`,
            now,
          );
        }),
      );
    }
    for (const [source, x] of this.manualUntil) {
      if (x.untilMs <= now) work.push(this.manualCondition(source, x.controllerId, false, null, ''));
    }
    for (const [source, st] of this.sources) {
      if (st.machine.shelvedUntilMs == null || st.machine.shelvedUntilMs > now) continue;
      if (this.cluster && !this.cluster.owns(controllerOf(source))) continue;
      work.push(
        this.serial(source, async () => {
          const cur = this.sources.get(source)!;
          const step = tickAlarm(cur.machine, now);
          if (step.transitions.length) await this.persist(source, cur, step, now, null, null);
        }),
      );
    }
    await Promise.allSettled(work);
  }

  /** What an alarm row records of what raised it: a rule, or a person's action (no rule). */
  private async apply(
    source: string,
    m: Meta,
    what: AlarmOrigin,
    st: SourceState,
    step: Step,
    e: Evaluation,
    describe: () => string,
    now: number,
    /** set by a person's action (a heater forced off), through any instance: not fenced */
    manual = false,
  ) {
    if (!step.transitions.length) {
      this.sources.set(source, { ...st, machine: step.machine });
      return;
    }
    const message = describe();
    if (step.transitions.includes('raised')) {
      const id = await this.repo.insertRaised(
        {
          source,
          kind: what.kind as AlarmRow['kind'],
          rule_id: what.ruleId,
          controller_id: m.id,
          site_id: m.siteId,
          priority: what.priority,
          state: isaState(step.machine),
          value: finite(e.value),
          message: `${m.serial}: ${message}`.slice(0, 300),
          machine: JSON.stringify(step.machine),
          raised_at: new Date(now),
          open_source: source,
        },
        manual ? undefined : this.fenceFor(source),
      );
      st = { ...st, alarmId: id };
    }
    await this.persist(
      source,
      st,
      step,
      now,
      null,
      null,
      message ? `${m.serial}: ${message}` : null,
      undefined,
      manual,
    );
  }

  /**
   * Writes a step's transitions in one transaction (the repository's one write
   * path, with whatever else belongs to the act), then tells listeners: events go
   * out only after the commit.
   */
  private async persist(
    source: string,
    st: SourceState,
    step: Step,
    now: number,
    personId: number | null,
    note: string | null,
    message?: string | null,
    also?: (trx: Knex.Transaction) => Promise<void>,
    manual = false,
  ): Promise<AlarmRow | null> {
    const alarmId = st.alarmId;
    const closed = step.transitions.includes('closed');
    // automatic steps are the owner's alone; a person's act may come through any instance
    const byPerson = personId != null || manual;
    const fence = byPerson ? undefined : this.fenceFor(source);
    const write = fence
      ? async (trx: Knex.Transaction) => {
          await fence(trx);
          await also?.(trx);
        }
      : also;
    const row = await this.repo.saveStep(
      {
        source,
        alarmId,
        machine: step.machine,
        transitions: step.transitions,
        state: isaState(step.machine),
        now: new Date(now),
        personId,
        note,
        message,
      },
      write,
    );
    this.sources.set(source, { machine: step.machine, alarmId: closed ? null : alarmId });
    if (byPerson) this.emit('acted', source);
    if (alarmId != null && row) {
      this.emit('change', {
        alarmId,
        siteId: row.site_id,
        controllerId: row.controller_id,
        state: row.state,
        transitions: step.transitions,
        priority: row.priority,
        kind: row.kind,
        message: row.message,
      } satisfies AlarmChange);
    }
    return row;
  }

  /** An operator's action on an open alarm, through the same state machine. */
  async act(
    alarm: number | AlarmRow,
    personId: number,
    action:
      { type: 'ack'; note: string | null } | { type: 'shelve'; untilMs: number; reason: string } | { type: 'unshelve' },
    /** written in the same transaction as the step (a photo's row, the audit entry) */
    also?: (trx: Knex.Transaction) => Promise<void>,
  ) {
    // a caller that has read the row already passes it: one read per request
    const row = typeof alarm === 'number' ? await this.repo.byId(alarm) : alarm;
    if (!row) throw new AlarmMissing();
    const alarmId = row.id;
    if (row.closed_at) throw new AlarmNotOpen();
    return this.serial(row.source, async () => {
      const st = this.sources.get(row.source) ?? { machine: this.repo.machineOf(row), alarmId };
      if (st.alarmId !== alarmId) throw new AlarmNotOpen();
      const now = this.clock();
      const step =
        action.type === 'ack'
          ? acknowledge(st.machine)
          : action.type === 'shelve'
            ? shelve(st.machine, now, action.untilMs)
            : unshelve(st.machine);
      const written = await this.persist(
        row.source,
        st,
        step,
        now,
        personId,
        action.type === 'ack' ? action.note : action.type === 'shelve' ? action.reason : null,
        null,
        also,
      );
      return written ?? row;
    });
  }

  private manualUntil = new Map<string, { untilMs: number; controllerId: number }>();

  /**
   * A condition set by people rather than readings (a heater forced off during
   * icing): medium priority, active until cleared or until its expiry passes.
   */
  async manualCondition(
    source: string,
    controllerId: number,
    active: boolean,
    untilMs: number | null,
    message: string,
  ) {
    const m = this.meta.get(controllerId) ?? (await this.reloadController(controllerId), this.meta.get(controllerId));
    if (!m) return;
    if (active && untilMs) this.manualUntil.set(source, { untilMs, controllerId });
    else this.manualUntil.delete(source);
    await this.serial(source, async () => {
      const st = this.sources.get(source) ?? { machine: idleMachine, alarmId: null };
      const step = stepAlarm(st.machine, { nowMs: this.clock(), raw: active }, { onDelayMs: 0, offDelayMs: 0 });
      await this.apply(
        source,
        m,
        { kind: 'heater-forced-off', ruleId: null, priority: 'medium' },
        st,
        step,
        { raw: active, value: null, suppress: false },
        () => message,
        this.clock(),
        true,
      );
    });
  }

  /** Out of service for every source of a controller (engineers). */
  async setOutOfService(controllerId: number, out: boolean, personId: number) {
    const work = ruleKinds.map((kind) => {
      const source = `${kind}:${controllerId}`;
      return this.serial(source, async () => {
        const st = this.sources.get(source) ?? { machine: idleMachine, alarmId: null };
        const step = setOutOfService(st.machine, out);
        if (!step.transitions.length) return;
        // an open alarm taken out of service is closed: it is no longer annunciated
        const s2 =
          out && st.alarmId != null ? { ...step, transitions: [...step.transitions, 'closed' as const] } : step;
        await this.persist(source, st, s2, this.clock(), personId, null);
      });
    });
    await Promise.all(work);
  }
}

/** No alarm with that id. */
export class AlarmMissing extends Error {}

export class AlarmNotOpen extends Error {}

type AlarmOrigin = { kind: string; ruleId: number | null; priority: Priority };
const origin = (r: Rule): AlarmOrigin => ({ kind: r.kind, ruleId: r.id, priority: r.priority });

const finite = (v: number | null | undefined) => (v == null || !Number.isFinite(v) ? null : v);
const pick = (m: Meta | undefined) =>
  m ? { lastSeenMs: m.lastSeenMs, recent: m.recent, wasIcing: m.wasIcing, icingEndedMs: m.icingEndedMs } : {};
