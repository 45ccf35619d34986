import { describe, expect, it } from 'vitest';

import type { ControllerRow } from '@/server/repositories/controllers';
import { vswrFromGamma } from '@/telemetry/math/rf';

import { toRow } from './rows';

const controller = { id: 7, forward_scale: 2, reflected_scale: 0.5, line_loss_db: 0 } as ControllerRow;
const reading = {
  v: 1 as const,
  seq: 3,
  boot: 'b1',
  ts: '2026-12-01T00:00:00.000Z',
  airTempC: -1,
  humidityPct: 90,
  moisture: true,
  forwardW: 500,
  reflectedW: 80,
  heater: { mode: 'auto' as const, on: true, currentA: 10 },
  supply: { volts: 240, batteryPct: null },
  flameProven: null,
};

describe('reading → stored row', () => {
  it('applies the coupler scale factors before working out VSWR', () => {
    const row = toRow(controller, reading, 'b1', new Date());
    expect(row.forward_w).toBe(1000);
    expect(row.reflected_w).toBe(40);
    // 4 % reflected is |Γ| = 0.2 (definition of the reflection coefficient)
    expect(row.vswr).toBeCloseTo(vswrFromGamma(0.2), 10);
  });

  it('works out VSWR at the antenna: a lossy line makes it worse than the coupler shows', () => {
    const row = toRow({ ...controller, line_loss_db: 1 }, reading, 'b1', new Date());
    expect(row.vswr!).toBeGreaterThan(vswrFromGamma(0.2));
    expect(row.return_loss_db).toBeCloseTo(10 * Math.log10(1000 / 40) - 2, 9);
  });

  it('stores no VSWR while the transmitter is off', () => {
    expect(toRow(controller, { ...reading, forwardW: 0, reflectedW: 0 }, 'b1', new Date()).vswr).toBeNull();
  });
});
