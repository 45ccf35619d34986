import { describe, expect, it } from 'vitest';

import type { ReadingPoint } from '@/telemetry/api';

import { clampZoom, tickWords, withLiveTail } from './chart-window';

const at = (iso: string, vswr: number): ReadingPoint => ({
  ts: iso,
  vswr,
  vswrMin: vswr,
  vswrMax: vswr,
  forwardW: 1000,
  reflectedW: 1,
  reflectedMaxW: 1,
  airTempC: -2,
  humidityPct: 95,
  moisture: true,
  heaterOn: true,
  heaterDuty: 1,
  heaterCurrentA: 10,
  batteryPct: null,
});
const ms = (iso: string) => Date.parse(iso);

describe('the live Site chart', () => {
  it('appends readings heard over /live after the stored ones, once each, inside the window', () => {
    const stored = [at('2026-12-03T10:00:00Z', 1.2), at('2026-12-03T10:00:05Z', 1.25)];
    const tail = [
      at('2026-12-03T10:00:05Z', 9), // the live copy of a stored point: the stored one stays
      at('2026-12-03T10:00:10Z', 1.3),
      at('2026-12-03T10:00:10Z', 1.3), // heard twice
      at('2026-12-03T10:00:15Z', 1.4),
    ];
    const out = withLiveTail(stored, tail, ms('2026-12-03T10:00:00Z'), ms('2026-12-03T10:00:12Z'));
    expect(out.map((p) => [p.ts.slice(11, 19), p.vswr])).toEqual([
      ['10:00:00', 1.2],
      ['10:00:05', 1.25],
      ['10:00:10', 1.3],
    ]);
  });

  it('a drag zooms inside the fetched span and never into the future; a click picks nothing', () => {
    const from = ms('2026-12-03T10:00:00Z');
    const to = ms('2026-12-03T10:15:00Z');
    const now = ms('2026-12-03T10:14:00Z');
    expect(clampZoom([ms('2026-12-03T10:10:00Z'), ms('2026-12-03T10:20:00Z')], from, to, now)).toEqual([
      ms('2026-12-03T10:10:00Z'),
      now,
    ]);
    // dragged right to left
    expect(clampZoom([ms('2026-12-03T10:05:00Z'), ms('2026-12-03T09:50:00Z')], from, to, now)).toEqual([
      from,
      ms('2026-12-03T10:05:00Z'),
    ]);
    expect(clampZoom([ms('2026-12-03T10:05:00Z'), ms('2026-12-03T10:05:04Z')], from, to, now)).toBeNull();
  });

  it('ticks use one 24-hour format in the site zone (Europe/Oslo is UTC+1 in December, per tzdata)', () => {
    const t = ms('2026-12-03T13:05:00Z');
    expect(tickWords(15 * 60_000, 'Europe/Oslo')(t)).toBe('14:05');
    expect(tickWords(3 * 60_000, 'Europe/Oslo')(t)).toBe('14:05:00');
    expect(tickWords(7 * 86_400_000, 'Europe/Oslo')(t)).toBe('12-03 14:05');
  });
});
