import { awaitsAck, type Priority } from '@/telemetry/alarms/machine';
import type { AlarmView } from '@/telemetry/api';

import { kindWords, stateWords } from './words';

/** What the open-alarm list is narrowed to; null means any. */
export type AlarmFilter = {
  priority: Priority | null;
  state: 'waiting' | 'acknowledged' | 'shelved' | 'out-of-service' | null;
  kind: string | null;
  /** words matched against the site's name, the kind, the state and the message */
  text: string;
};

export const noFilter: AlarmFilter = { priority: null, state: null, kind: null, text: '' };

const inState = (a: AlarmView, s: NonNullable<AlarmFilter['state']>) =>
  s === 'waiting' ? awaitsAck(a.state) : a.state === s;

/** The alarms matching every part of the filter; every word of the text must match somewhere. */
export function filterAlarms(alarms: AlarmView[], f: AlarmFilter, siteName: (siteId: number) => string): AlarmView[] {
  const words = f.text.toLowerCase().split(/\s+/).filter(Boolean);
  return alarms.filter((a) => {
    if (f.priority && a.priority !== f.priority) return false;
    if (f.state && !inState(a, f.state)) return false;
    if (f.kind && a.kind !== f.kind) return false;
    if (!words.length) return true;
    const hay = [siteName(a.siteId), kindWords[a.kind] ?? a.kind, stateWords[a.state] ?? a.state, a.message, a.priority]
      .join(' ')
      .toLowerCase();
    return words.every((w) => hay.includes(w));
  });
}
