import { describe, expect, it } from 'vitest';
import { commandSchema, parseTelemetry, parseTopic, topics } from './wire';

// the example reading of the wire contract (shared/design.md)
const example = {
  v: 1, seq: 1042, ts: '2026-12-01T21:00:00.000Z', airTempC: -3.2, humidityPct: 96, moisture: true,
  forwardW: 5000, reflectedW: 45, heater: { mode: 'auto', on: true, currentA: 17.8 },
  supply: { volts: 240.1, batteryPct: null }, flameProven: null,
};

describe('wire contract v1', () => {
  it('accepts the contract example, alone or in an array', () => {
    expect(parseTelemetry(JSON.stringify(example))).toMatchObject({ ok: true, readings: [{ seq: 1042 }] });
    const two = parseTelemetry(JSON.stringify([example, { ...example, seq: 1043 }]));
    expect(two.ok && two.readings.map((r) => r.seq)).toEqual([1042, 1043]);
  });

  it('rejects with a reason that names the field', () => {
    const bad = parseTelemetry(JSON.stringify({ ...example, airTempC: 140 }));
    expect(bad).toEqual({ ok: false, reason: expect.stringContaining('airTempC') });
    expect(parseTelemetry('{not json')).toEqual({ ok: false, reason: 'not JSON' });
    const arr = parseTelemetry(JSON.stringify([example, { ...example, heater: { mode: 'sideways', on: true, currentA: 1 } }]));
    expect(arr).toEqual({ ok: false, reason: expect.stringContaining('heater.mode') });
  });

  it('topics round-trip and foreign topics are not ours', () => {
    const t = topics('KTP-FM-01');
    expect(parseTopic(t.telemetry)).toEqual({ serial: 'KTP-FM-01', channel: 'telemetry' });
    expect(parseTopic(t.result)).toEqual({ serial: 'KTP-FM-01', channel: 'result' });
    expect(parseTopic('thawline/v1/x/y/z')).toBe(null);
  });

  it('commands are a discriminated union', () => {
    expect(commandSchema.safeParse({ v: 1, id: 'c1', type: 'replay', fromSeq: 10, toSeq: 20 }).success).toBe(true);
    expect(commandSchema.safeParse({ v: 1, id: 'c1', type: 'heater', mode: 'forced-on', reason: '' }).success).toBe(false);
  });
});
