import { describe, expect, it } from 'vitest';

import { allOf, anyOf, ratePerMinute, silentCondition, thresholdCondition } from './conditions';
import {
  acknowledge,
  AlarmActionError,
  type AlarmMachine,
  idleMachine,
  isaState,
  setOutOfService,
  shelve,
  stepAlarm,
  tickAlarm,
  unshelve,
} from './machine';

const s = 1000;
const timing = { onDelayMs: 10 * s, offDelayMs: 30 * s };

function feed(m0: AlarmMachine, inputs: [number, boolean | null, boolean?][]) {
  let m = m0;
  const all: string[] = [];
  for (const [t, raw, suppress] of inputs) {
    const r = stepAlarm(m, { nowMs: t * s, raw, suppress }, timing);
    m = r.machine;
    all.push(...r.transitions);
  }
  return { m, all };
}

describe('ISA-18.2 alarm life cycle', () => {
  it('normal → unacknowledged → acknowledged → normal (ISA-18.2 state diagram, path A)', () => {
    const raised = feed(idleMachine, [
      [0, true],
      [10, true],
    ]);
    expect(isaState(raised.m)).toBe('unacknowledged');
    const acked = acknowledge(raised.m);
    expect(isaState(acked.machine)).toBe('acknowledged');
    const cleared = feed(acked.machine, [
      [20, false],
      [50, false],
    ]);
    expect(isaState(cleared.m)).toBe('normal');
    expect(cleared.all).toEqual(['returned', 'closed']);
  });

  it('unacknowledged → returned-to-normal unacknowledged → acknowledged closes it (ISA-18.2 path B)', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
      [11, false],
      [41, false],
    ]);
    expect(isaState(r.m)).toBe('rtn-unacknowledged');
    const a = acknowledge(r.m);
    expect(isaState(a.machine)).toBe('normal');
    expect(a.transitions).toEqual(['acknowledged', 'closed']);
  });

  it('a returned alarm that comes back before acknowledgement is reactivated, not a new alarm', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
      [11, false],
      [41, false],
      [50, true],
      [60, true],
    ]);
    expect(r.all).toEqual(['raised', 'returned', 'reactivated']);
    expect(isaState(r.m)).toBe('unacknowledged');
  });

  it('on-delay and off-delay hold back short excursions (OPC UA Part 9 Annex B)', () => {
    const blip = feed(idleMachine, [
      [0, true],
      [9, true],
      [9.5, false],
      [12, true],
      [21, true],
    ]);
    expect(blip.all).toEqual([]);
    expect(blip.m.active).toBe(false);
    const dip = feed({ ...idleMachine, active: true, acked: true }, [
      [0, false],
      [29, false],
      [29.5, true],
      [100, true],
    ]);
    expect(dip.all).toEqual([]);
  });

  it('no data holds the state', () => {
    const r = feed(idleMachine, [
      [0, true],
      [5, null],
      [10, true],
    ]);
    expect(r.m.active).toBe(true);
  });

  it('suppressed by design while the transmitter is off, evaluated again after', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
    ]);
    const a = acknowledge(r.m).machine;
    const off = feed(a, [[20, true, true]]);
    expect(isaState(off.m)).toBe('suppressed');
    expect(off.m.active).toBe(false);
    const back = feed(off.m, [
      [30, true, false],
      [35, true],
      [41, true],
    ]);
    expect(back.all).toEqual(['unsuppressed', 'raised']);
    expect(isaState(back.m)).toBe('unacknowledged');
  });

  it('shelving: by hand back to acknowledged; on expiry back to unacknowledged (ISA-18.2 shelving)', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
    ]).m;
    const shelved = shelve(r, 10 * s, 3600 * s).machine;
    expect(isaState(shelved)).toBe('shelved');
    expect(isaState(unshelve(shelved).machine)).toBe('acknowledged');
    const early = tickAlarm(shelved, 100 * s);
    expect(early.transitions).toEqual([]);
    const expired = tickAlarm(shelved, 3600 * s);
    expect(expired.transitions).toEqual(['shelf-expired']);
    expect(isaState(expired.machine)).toBe('unacknowledged');
  });

  it('a shelf longer than 24 h, in the past, or on a closed alarm is refused', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
    ]).m;
    expect(() => shelve(r, 0, 25 * 3600 * s)).toThrow(AlarmActionError);
    expect(() => shelve(r, 10 * s, 5 * s)).toThrow(AlarmActionError);
    expect(() => shelve(idleMachine, 0, 60 * s)).toThrow(AlarmActionError);
    expect(() => acknowledge(idleMachine)).toThrow(AlarmActionError);
  });

  it('out of service hides the alarm and ignores the condition until returned to service', () => {
    const r = feed(idleMachine, [
      [0, true],
      [10, true],
    ]).m;
    const oos = setOutOfService(r, true).machine;
    expect(isaState(oos)).toBe('out-of-service');
    expect(
      feed(oos, [
        [20, true],
        [40, true],
      ]).all,
    ).toEqual([]);
    const back = setOutOfService(oos, false).machine;
    expect(
      feed(back, [
        [50, true],
        [60, true],
      ]).all,
    ).toEqual(['raised']);
  });
});

describe('conditions', () => {
  it('threshold with deadband: enter above the limit, leave below limit − deadband', () => {
    expect(thresholdCondition(1.51, 1.5, 'above', 0.05, false)).toBe(true);
    expect(thresholdCondition(1.5, 1.5, 'above', 0.05, false)).toBe(false);
    expect(thresholdCondition(1.47, 1.5, 'above', 0.05, true)).toBe(true);
    expect(thresholdCondition(1.44, 1.5, 'above', 0.05, true)).toBe(false);
    expect(thresholdCondition(null, 1.5, 'above', 0.05, true)).toBe(null);
    expect(thresholdCondition(10, 20, 'below', 1, false)).toBe(true);
  });

  it('rate of change is the least-squares slope per minute', () => {
    const samples = Array.from({ length: 11 }, (_, i) => ({ tMs: i * 6000, v: 1.1 + 0.01 * i }));
    expect(ratePerMinute(samples, 120_000, 60_000)).toBeCloseTo(0.1, 9);
    expect(ratePerMinute(samples.slice(0, 1), 120_000, 60_000)).toBe(null);
  });

  it('silence counts missed intervals; a never-seen controller is waiting, not silent', () => {
    expect(silentCondition(0, 31_000, 10_000, 3)).toBe(true);
    expect(silentCondition(0, 30_000, 10_000, 3)).toBe(false);
    expect(silentCondition(null, 1e9, 10_000, 3)).toBe(false);
  });

  it('combinations are three-valued', () => {
    expect(allOf(true, true)).toBe(true);
    expect(allOf(true, null)).toBe(null);
    expect(allOf(false, null)).toBe(false);
    expect(anyOf(false, null)).toBe(null);
    expect(anyOf(true, null)).toBe(true);
  });
});
