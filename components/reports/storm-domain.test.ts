import { describe, expect, it } from 'vitest';

import { stormDomain } from './storm-domain';

const point = (ts: string, vswrMax: number) => ({ ts, vswrMax }) as never;

describe('the storm chart’s axes', () => {
  it('spans the icing with a margin, not the whole day asked for', () => {
    const d = stormDomain(
      { icingStart: '2026-12-02T10:00:00.000Z', icingEnd: '2026-12-02T10:50:00.000Z' },
      {
        timeline: [point('2026-12-02T00:00:00.000Z', 1.1), point('2026-12-02T23:00:00.000Z', 1.1)],
        trip: 2,
        warning: 1.5,
        peakVswr: 1.8,
      },
    );
    // 50 min of icing: at least 10 min either side
    expect(d.x[0].toISOString()).toBe('2026-12-02T09:50:00.000Z');
    expect(d.x[1].toISOString()).toBe('2026-12-02T11:00:00.000Z');
  });
  it('starts VSWR at 1.00:1 and reaches past both the peak and the trip level', () => {
    const d = stormDomain(
      { icingStart: null, icingEnd: null },
      {
        timeline: [point('2026-12-02T10:00:00.000Z', 1.3), point('2026-12-02T14:00:00.000Z', 1.25)],
        trip: 2,
        warning: 1.5,
        peakVswr: 1.3,
      },
    );
    expect(d.y[0]).toBe(1);
    expect(d.y[1]).toBeGreaterThan(2);
    // no icing seen: the trace's own span, 15 % either side
    expect(d.x[0].toISOString()).toBe('2026-12-02T09:24:00.000Z');
  });
});
