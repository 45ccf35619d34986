import { describe, expect, it } from 'vitest';

import { alarmQueue, type QueueAlarm } from './queue';

// invented alarms for the ordering rules; no published figure is involved
const t0 = Date.parse('2026-12-01T20:00:00Z');
const al = (id: number, siteId: number, priority: QueueAlarm['priority'], minutesAgo: number): QueueAlarm => ({
  id,
  siteId,
  priority,
  raisedAt: new Date(t0 - minutesAgo * 60_000).toISOString(),
});
const shape = (q: ReturnType<typeof alarmQueue>) =>
  q.map((e) => (e.kind === 'alarm' ? e.alarm.id : `summary:${e.siteId}:${e.folded.length}`));

describe('alarm queue', () => {
  it('puts priority first, then the longest waiting', () => {
    expect(
      shape(alarmQueue([al(1, 1, 'low', 50), al(2, 2, 'critical', 1), al(3, 3, 'high', 5), al(4, 4, 'high', 30)])),
    ).toEqual([2, 4, 3, 1]);
  });

  it('a flood folds its lower-priority alarms, and its critical one stays first in the list', () => {
    const flood = [al(10, 5, 'critical', 2), ...[11, 12, 13, 14, 15, 16].map((id, i) => al(id, 5, 'medium', 10 + i))];
    expect(shape(alarmQueue([...flood, al(20, 6, 'high', 60)]))).toEqual([10, 20, 'summary:5:6']);
  });

  it('never folds an alarm that outranks one listed elsewhere', () => {
    // with only a high listed elsewhere, the flood's mediums and lows fold; its highs never do
    const flood = [
      al(30, 7, 'high', 1),
      al(31, 7, 'high', 2),
      al(32, 7, 'medium', 3),
      al(33, 7, 'medium', 4),
      al(34, 7, 'low', 5),
    ];
    const q = alarmQueue([...flood, al(40, 8, 'high', 9)]);
    expect(shape(q)).toEqual([40, 31, 30, 'summary:7:3']);
    const summary = q.find((e) => e.kind === 'summary');
    expect(summary?.kind === 'summary' && summary.counts).toEqual([
      ['medium', 2],
      ['low', 1],
    ]);
    // a low listed at another site: a medium may no longer hide behind the summary, and one folded low is just listed
    expect(shape(alarmQueue([...flood, al(41, 8, 'low', 9)]))).toEqual([31, 30, 33, 32, 41, 34]);
  });

  it('lists everything once a site is opened', () => {
    const flood = [1, 2, 3, 4, 5].map((id) => al(id, 9, 'low', id));
    expect(shape(alarmQueue(flood))).toEqual(['summary:9:5']);
    expect(shape(alarmQueue(flood, new Set([9])))).toEqual([5, 4, 3, 2, 1]);
  });
});
