/**
 * Alarm life cycle per rule and source, after ISA-18.2 / IEC 62682: normal,
 * unacknowledged, acknowledged, returned-to-normal unacknowledged, shelved,
 * suppressed by design, out of service. On-delay, off-delay and deadband as in
 * OPC UA Part 9 (IEC 62541-9) Annex B. Pure and deterministic given a clock.
 */
export const priorities = ['critical', 'high', 'medium', 'low'] as const;
export type Priority = (typeof priorities)[number];

export const isaStates = [
  'normal',
  'unacknowledged',
  'acknowledged',
  'rtn-unacknowledged',
  'shelved',
  'suppressed',
  'out-of-service',
] as const;
export type IsaState = (typeof isaStates)[number];

/** Raised or cleared, and not yet acknowledged: an alarm still waiting for someone (ISA-18.2). */
export const awaitsAck = (state: string | null | undefined) =>
  state === 'unacknowledged' || state === 'rtn-unacknowledged';

export type Timing = { onDelayMs: number; offDelayMs: number };

export type AlarmMachine = {
  /** the debounced condition */
  active: boolean;
  /** when the raw condition started to differ from `active` */
  pendingSinceMs: number | null;
  acked: boolean;
  shelvedUntilMs: number | null;
  suppressed: boolean;
  outOfService: boolean;
  /** last value that drove the condition, for the alarm row */
  value: number | null;
};

export const idleMachine: AlarmMachine = {
  active: false,
  pendingSinceMs: null,
  acked: true,
  shelvedUntilMs: null,
  suppressed: false,
  outOfService: false,
  value: null,
};

export type Transition =
  | 'raised'
  | 'acknowledged'
  | 'returned'
  | 'reactivated'
  | 'closed'
  | 'shelved'
  | 'unshelved'
  | 'shelf-expired'
  | 'suppressed'
  | 'unsuppressed'
  | 'out-of-service'
  | 'in-service';

export type Step = { machine: AlarmMachine; transitions: Transition[] };

/** The ISA-18.2 state shown to people, derived from the machine. */
export function isaState(m: AlarmMachine): IsaState {
  if (m.outOfService) return 'out-of-service';
  if (m.shelvedUntilMs != null) return 'shelved';
  if (m.suppressed) return 'suppressed';
  if (m.active) return m.acked ? 'acknowledged' : 'unacknowledged';
  return m.acked ? 'normal' : 'rtn-unacknowledged';
}

/** An alarm is open (listed) from its raise until it is back to normal. */
export const isOpen = (m: AlarmMachine) => m.active || !m.acked;

function setActive(m: AlarmMachine, active: boolean): Step {
  if (active === m.active) return { machine: m, transitions: [] };
  if (active) {
    const wasOpen = isOpen(m);
    return {
      machine: { ...m, active: true, acked: false, pendingSinceMs: null },
      transitions: [wasOpen ? 'reactivated' : 'raised'],
    };
  }
  const next = { ...m, active: false, pendingSinceMs: null };
  return { machine: next, transitions: next.acked ? ['returned', 'closed'] : ['returned'] };
}

/**
 * One evaluation. `raw` is the undebounced condition (null = no data: hold);
 * `suppress` is the suppressed-by-design condition (e.g. transmitter off).
 */
export function stepAlarm(
  m0: AlarmMachine,
  input: { nowMs: number; raw: boolean | null; suppress?: boolean; value?: number | null },
  timing: Timing,
): Step {
  // the steady state (nothing changes) returns the same machine: no allocation per reading
  let m = input.value !== undefined && input.value !== m0.value ? { ...m0, value: input.value } : m0;
  const transitions: Transition[] = [];
  const suppress = !!input.suppress;
  if (suppress !== m.suppressed) {
    m = { ...m, suppressed: suppress, pendingSinceMs: null };
    transitions.push(suppress ? 'suppressed' : 'unsuppressed');
    // a suppressed condition is not evaluated: it drops at once, and restarts its on-delay after
    if (suppress && m.active) {
      const s = setActive(m, false);
      m = s.machine;
      transitions.push(...s.transitions);
    }
  }
  if (m.suppressed || m.outOfService || input.raw == null) return { machine: m, transitions };
  if (input.raw === m.active)
    return { machine: m.pendingSinceMs == null ? m : { ...m, pendingSinceMs: null }, transitions };
  const since = m.pendingSinceMs ?? input.nowMs;
  const delay = input.raw ? timing.onDelayMs : timing.offDelayMs;
  if (input.nowMs - since >= delay) {
    const s = setActive(m, input.raw);
    return { machine: s.machine, transitions: [...transitions, ...s.transitions] };
  }
  return { machine: { ...m, pendingSinceMs: since }, transitions };
}

export class AlarmActionError extends Error {}

export function acknowledge(m: AlarmMachine): Step {
  if (m.outOfService) throw new AlarmActionError('Out of service: nothing to acknowledge');
  if (m.acked) throw new AlarmActionError('Already acknowledged');
  const next = { ...m, acked: true };
  return { machine: next, transitions: next.active ? ['acknowledged'] : ['acknowledged', 'closed'] };
}

export const maxShelveMs = 24 * 3_600_000;

export function shelve(m: AlarmMachine, nowMs: number, untilMs: number): Step {
  if (m.outOfService) throw new AlarmActionError('An out-of-service alarm cannot be shelved');
  if (!isOpen(m)) throw new AlarmActionError('Only an open alarm can be shelved');
  if (!(untilMs > nowMs)) throw new AlarmActionError('The shelf must end in the future');
  if (untilMs - nowMs > maxShelveMs) throw new AlarmActionError('An alarm can be shelved for at most 24 hours');
  return { machine: { ...m, shelvedUntilMs: untilMs }, transitions: ['shelved'] };
}

/** Unshelving by hand returns the alarm to acknowledged (or normal if it cleared meanwhile). */
export function unshelve(m: AlarmMachine): Step {
  if (m.shelvedUntilMs == null) throw new AlarmActionError('The alarm is not shelved');
  const next = { ...m, shelvedUntilMs: null, acked: true };
  return { machine: next, transitions: next.active ? ['unshelved'] : ['unshelved', 'closed'] };
}

/** A shelf that expires returns a standing alarm to unacknowledged, so expiry never hides it. */
export function tickAlarm(m: AlarmMachine, nowMs: number): Step {
  if (m.shelvedUntilMs == null || nowMs < m.shelvedUntilMs) return { machine: m, transitions: [] };
  if (m.active) return { machine: { ...m, shelvedUntilMs: null, acked: false }, transitions: ['shelf-expired'] };
  return { machine: { ...m, shelvedUntilMs: null, acked: true }, transitions: ['shelf-expired', 'closed'] };
}

export function setOutOfService(m: AlarmMachine, out: boolean): Step {
  if (out === m.outOfService) return { machine: m, transitions: [] };
  if (out)
    return {
      machine: { ...m, outOfService: true, active: false, acked: true, pendingSinceMs: null, shelvedUntilMs: null },
      transitions: ['out-of-service'],
    };
  return { machine: { ...m, outOfService: false }, transitions: ['in-service'] };
}
