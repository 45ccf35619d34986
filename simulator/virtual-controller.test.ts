import { describe, expect, it } from 'vitest';

import { readingSchema } from '@/telemetry/wire';

import { VirtualController } from './virtual-controller';
import { weatherAt } from './weather';

const spec = { serial: 'SIM-1', kind: 'heater' as const, heaterKw: 8, forwardW: 5000, offGrid: null, seed: 3 };

describe('virtual controller', () => {
  it('sends readings that satisfy the wire contract, with growing sequence numbers', () => {
    const d = new VirtualController(spec);
    const a = d.sample(0, 0);
    const b = d.sample(2000, 1);
    expect(readingSchema.safeParse(a).success).toBe(true);
    expect(b.seq).toBe(a.seq + 1);
  });

  it('replays the readings a replay command asks for', () => {
    const d = new VirtualController(spec);
    for (let i = 0; i < 20; i++) d.sample(i * 1000, i);
    const r = d.handle({ v: 1, id: 'c', type: 'replay', fromSeq: 5, toSeq: 9 }, 20_000);
    expect(r.replay.map((x) => x.seq)).toEqual([5, 6, 7, 8, 9]);
  });

  it('builds ice and VSWR through a storm when the heater has failed, far less when it works', () => {
    const run = (faultyHeater: boolean) => {
      const d = new VirtualController({ ...spec, faultyHeater });
      let max = 0;
      for (let m = 0; m < 240; m += 1) max = Math.max(max, d.sample(m * 60_000, m).reflectedW);
      return max;
    };
    expect(run(true)).toBeGreaterThan(run(false) * 2);
  });

  it('the weather has cold, wet storms and milder dry spells', () => {
    const w = Array.from({ length: 240 }, (_, m) => weatherAt(m, 1));
    expect(w.some((x) => x.airTempC < -2 && x.precipMmH > 0.5)).toBe(true);
    expect(w.some((x) => x.airTempC > 0 && x.precipMmH === 0)).toBe(true);
  });
});
