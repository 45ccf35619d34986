import { describe, expect, it } from 'vitest';

import { defaultHeaterSettings, type HeaterState, initialHeaterState, setHeaterMode, stepHeater } from './heater';
import { fToC } from './units';

const min = 60_000;

function run(steps: { at: number; t: number; wet: boolean }[], start: HeaterState = initialHeaterState) {
  let st = start;
  return steps.map((s) => {
    const r = stepHeater(st, { nowMs: s.at * min, airTempC: s.t, moisture: s.wet });
    st = r.state;
    return [r.state.on, r.reason] as const;
  });
}

describe('de-icing controller logic', () => {
  it('defaults follow controller practice: 38 °F call-for-heat, 40 °F shut-off, 30 min after-run (common practice; IECC R403.9 for the shut-off)', () => {
    expect(defaultHeaterSettings.onBelowC).toBeCloseTo(fToC(38), 0);
    expect(defaultHeaterSettings.highCutoffC).toBeCloseTo(fToC(40), 0);
    expect(defaultHeaterSettings.afterRunMin).toBe(30);
  });

  it('heats on cold moisture, holds for the after-run, then stops', () => {
    const r = run([
      { at: 0, t: -1, wet: false },
      { at: 1, t: -1, wet: true },
      { at: 20, t: -1, wet: false },
      { at: 30, t: -1, wet: false },
      { at: 31, t: -1, wet: false },
    ]);
    expect(r).toEqual([
      [false, 'idle'],
      [true, 'calling'],
      [true, 'after-run'],
      [true, 'after-run'],
      [false, 'idle'],
    ]);
  });

  it('does not heat warm moisture, and shuts off above the high cut-off even in after-run', () => {
    expect(run([{ at: 0, t: 3.5, wet: true }])[0]).toEqual([false, 'idle']);
    const r = run([
      { at: 0, t: 0, wet: true },
      { at: 5, t: 4.5, wet: false },
    ]);
    expect(r[1]).toEqual([false, 'high-temp-cutoff']);
  });

  it('honours a low-temperature cut-out when set', () => {
    const st = stepHeater(
      initialHeaterState,
      { nowMs: 0, airTempC: -25, moisture: true },
      { ...defaultHeaterSettings, lowCutoutC: -20 },
    );
    expect(st.reason).toBe('low-temp-cutout');
    expect(st.state.on).toBe(false);
  });

  it('forced modes win until they expire, then automatic returns', () => {
    const forced = setHeaterMode(initialHeaterState, 'forced-off', 60 * min);
    const r = run(
      [
        { at: 10, t: -3, wet: true },
        { at: 60, t: -3, wet: true },
      ],
      forced,
    );
    expect(r).toEqual([
      [false, 'forced-off'],
      [true, 'calling'],
    ]);
    const on = setHeaterMode(initialHeaterState, 'forced-on', null);
    expect(stepHeater(on, { nowMs: 0, airTempC: 20, moisture: false }).state.on).toBe(true);
  });
});
