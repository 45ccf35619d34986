import { describe, expect, it } from 'vitest';

import {
  type AlarmRecord,
  type AlarmTransition,
  annunciations,
  badActors,
  benchmarks,
  floods,
  priorityDistribution,
  ratePer10Min,
  rateVerdict,
  stale,
  timeToAcknowledge,
  topContributors,
} from './stats';

const min = 60_000;
const a = (source: string, raisedMin: number, extra: Partial<AlarmRecord> = {}): AlarmRecord => ({
  source,
  priority: 'low',
  raisedMs: raisedMin * min,
  ackMs: null,
  clearedMs: null,
  ...extra,
});

describe('alarm-rate statistics', () => {
  it('benchmarks: 1 per 10 min acceptable, 2 manageable, flood above 10 per 10 min (ISA-18.2, [M] for exact wording)', () => {
    // ISA-18.2 Table 5: ~150 alarms/day per operator very likely acceptable, ~300 maximum manageable.
    expect(150 / (24 * 6)).toBeCloseTo(benchmarks.acceptablePer10Min, 0);
    expect(300 / (24 * 6)).toBeCloseTo(benchmarks.manageablePer10Min, 0);
    expect(benchmarks.floodStartsAbovePer10Min).toBe(10);
    expect(rateVerdict(0.8)).toBe('very likely acceptable');
    expect(rateVerdict(1.5)).toBe('manageable');
    expect(rateVerdict(3)).toBe('likely over-demanding');
  });

  it('bins raises per 10 minutes and finds a flood that starts above 10 and ends below 5', () => {
    const list = [
      ...Array.from({ length: 11 }, (_, i) => a(`s${i}`, 10 + i * 0.5)),
      ...Array.from({ length: 6 }, (_, i) => a(`t${i}`, 20 + i)),
      a('u', 35),
    ];
    const bins = ratePer10Min(list, 0, 60 * min);
    expect(bins).toEqual([0, 11, 6, 1, 0, 0]);
    expect(floods(bins, 0)).toEqual([{ startMs: 10 * min, endMs: 30 * min, count: 17 }]);
    expect(floods([10, 10, 10], 0)).toEqual([]);
  });

  it('finds chattering (3 raises within a minute, common practice) and stale alarms (over 24 h)', () => {
    const list = [
      a('vswr:KTP', 0),
      a('vswr:KTP', 0.4),
      a('vswr:KTP', 0.9),
      a('silent:BRC', 0),
      a('silent:BRC', 2),
      a('silent:BRC', 4),
    ];
    expect(badActors(list).chattering.map((o) => o.source)).toEqual(['vswr:KTP']);
    expect(stale([a('x', 0), a('y', 0, { clearedMs: 5 * min })], 25 * 60 * min).map((r) => r.source)).toEqual(['x']);
  });

  it('ranks top contributors and shares', () => {
    const list = [a('a', 0), a('a', 1), a('a', 2), a('b', 3)];
    expect(topContributors(list)).toEqual([
      { source: 'a', count: 3, share: 0.75 },
      { source: 'b', count: 1, share: 0.25 },
    ]);
  });

  it('priority distribution and time to acknowledge', () => {
    const list = [
      a('a', 0, { priority: 'high', ackMs: 1 * min }),
      a('b', 0, { ackMs: 3 * min }),
      a('c', 0, { ackMs: 5 * min }),
      a('d', 0),
    ];
    expect(priorityDistribution(list)).toEqual({ critical: 0, high: 0.25, medium: 0, low: 0.75 });
    const t = timeToAcknowledge(list);
    expect(t.medianMs).toBe(3 * min);
    expect(t.unacknowledged).toBe(1);
  });
});

describe('annunciations and bad actors', () => {
  // ISA-18.2 and EEMUA 191 count annunciations: each time an alarm is presented. An invented
  // rule that returns to normal and reactivates 20 times in 40 minutes is 20 alarms, not 1.
  const t0 = Date.parse('2026-12-01T20:00:00Z');
  const chatter: AlarmTransition[] = [];
  for (let i = 0; i < 20; i++) {
    chatter.push({
      alarmId: 1,
      source: 'vswr|KTP-1|1',
      priority: 'high',
      atMs: t0 + i * 120_000,
      transition: i === 0 ? 'raised' : 'reactivated',
    });
    chatter.push({
      alarmId: 1,
      source: 'vswr|KTP-1|1',
      priority: 'high',
      atMs: t0 + i * 120_000 + 3_000,
      transition: 'returned',
    });
  }
  // three activations inside one minute: chattering by the common-practice rule of thumb (3 in 60 s)
  const burst: AlarmTransition[] = [0, 20_000, 40_000].flatMap((d, i) => [
    {
      alarmId: 2,
      source: 'silent|BRC-1|2',
      priority: 'medium' as const,
      atMs: t0 + d,
      transition: i === 0 ? 'raised' : 'reactivated',
    },
    {
      alarmId: 2,
      source: 'silent|BRC-1|2',
      priority: 'medium' as const,
      atMs: t0 + d + 10_000,
      transition: 'returned',
    },
  ]);

  it('counts each activation as one alarm', () => {
    const recs = annunciations([...chatter, ...burst]);
    expect(recs.filter((r) => r.source === 'vswr|KTP-1|1')).toHaveLength(20);
    expect(recs.filter((r) => r.source === 'silent|BRC-1|2')).toHaveLength(3);
    expect(recs[0].clearedMs! - recs[0].raisedMs).toBe(3_000);
  });

  it('flags chattering and fleeting alarms with their counts', () => {
    const { chattering: c, fleeting: f } = badActors(annunciations([...chatter, ...burst]));
    expect(c).toEqual([{ source: 'silent|BRC-1|2', activations: 3, mostInOneMinute: 3, fleeting: 0 }]);
    // back to normal 3 s after each activation: all 20 are fleeting (5 s threshold, common practice)
    expect(f).toEqual([{ source: 'vswr|KTP-1|1', activations: 20, mostInOneMinute: 1, fleeting: 20 }]);
  });
});
