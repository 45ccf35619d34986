import { describe, expect, it } from 'vitest';

import { awaitsAck } from '@/telemetry/alarms/machine';
import type { AlarmView } from '@/telemetry/api';

import { filterAlarms, noFilter } from './filter';

const alarm = (id: number, over: Partial<AlarmView>): AlarmView => ({
  id,
  kind: 'vswr-warning',
  priority: 'medium',
  state: 'unacknowledged',
  siteId: 1,
  controllerId: 1,
  raisedAt: '2026-12-03T04:00:00.000Z',
  value: 1.6,
  message: 'VSWR 1.60:1 at the antenna (limit 1.5:1)',
  ackedAt: null,
  ackNote: null,
  clearedAt: null,
  closedAt: null,
  shelvedUntil: null,
  ...over,
});
const names: Record<number, string> = { 1: 'North Ridge', 2: 'Harbour Mast' };
const name = (id: number) => names[id];

describe('the open-alarm filter', () => {
  const list = [
    alarm(1, {}),
    alarm(2, { priority: 'critical', kind: 'vswr-trip', siteId: 2 }),
    alarm(3, { state: 'acknowledged', siteId: 2 }),
    alarm(4, { state: 'rtn-unacknowledged', kind: 'silent', message: 'No reading for 5 min' }),
    alarm(5, { state: 'shelved', priority: 'low' }),
  ];
  it('keeps everything without a filter', () => {
    expect(filterAlarms(list, noFilter, name)).toHaveLength(5);
  });
  it('narrows by priority, kind and state; "waiting" is raised or cleared but not acknowledged', () => {
    expect(filterAlarms(list, { ...noFilter, priority: 'critical' }, name).map((a) => a.id)).toEqual([2]);
    expect(filterAlarms(list, { ...noFilter, kind: 'silent' }, name).map((a) => a.id)).toEqual([4]);
    expect(filterAlarms(list, { ...noFilter, state: 'waiting' }, name).map((a) => a.id)).toEqual([1, 2, 4]);
    expect(filterAlarms(list, { ...noFilter, state: 'shelved' }, name).map((a) => a.id)).toEqual([5]);
  });
  it('searches the site name, the kind in words and the message, every word', () => {
    expect(filterAlarms(list, { ...noFilter, text: 'harbour' }, name).map((a) => a.id)).toEqual([2, 3]);
    expect(filterAlarms(list, { ...noFilter, text: 'harbour trip' }, name).map((a) => a.id)).toEqual([2]);
    expect(filterAlarms(list, { ...noFilter, text: 'controller silent' }, name).map((a) => a.id)).toEqual([4]);
    expect(filterAlarms(list, { ...noFilter, text: 'nowhere' }, name)).toEqual([]);
  });
  it('counts raised and cleared-but-unacknowledged alarms as awaiting acknowledgement', () => {
    expect(list.filter((a) => awaitsAck(a.state)).map((a) => a.id)).toEqual([1, 2, 4]);
  });
});
