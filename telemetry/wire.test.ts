import { describe, expect, it } from 'vitest';

import { commandSchema, maxClockAheadMs, parseTelemetry, parseTopic, readingTimeProblem, topics } from './wire';

// the example reading of the wire contract (shared/design.md), with the boot id that v1 now requires
const example = {
  v: 1,
  seq: 1042,
  boot: 'b7f3-0001',
  ts: '2026-12-01T21:00:00.000Z',
  airTempC: -3.2,
  humidityPct: 96,
  moisture: true,
  forwardW: 5000,
  reflectedW: 45,
  heater: { mode: 'auto', on: true, currentA: 17.8 },
  supply: { volts: 240.1, batteryPct: null },
  flameProven: null,
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
    const arr = parseTelemetry(
      JSON.stringify([example, { ...example, heater: { mode: 'sideways', on: true, currentA: 1 } }]),
    );
    expect(arr).toEqual({ ok: false, reason: expect.stringContaining('heater.mode') });
  });

  it('requires a boot id: without it a restarted device would look like old readings', () => {
    const { boot: _boot, ...noBoot } = example;
    expect(parseTelemetry(JSON.stringify(noBoot))).toEqual({ ok: false, reason: expect.stringContaining('boot') });
    expect(parseTelemetry(JSON.stringify({ ...example, boot: 'has space' }))).toEqual({
      ok: false,
      reason: expect.stringContaining('boot'),
    });
  });

  it('refuses reading times the server cannot store or trust, and names the problem', () => {
    const now = Date.parse('2026-12-03T00:00:00.000Z');
    const day = 86_400_000;
    expect(readingTimeProblem(now, now, 90 * day)).toBeNull();
    expect(readingTimeProblem(now + maxClockAheadMs, now, 90 * day)).toBeNull();
    expect(readingTimeProblem(now + maxClockAheadMs + 1, now, 90 * day)).toMatch(/ahead of the server clock/);
    expect(readingTimeProblem(Date.parse('2040-01-01T00:00:00Z'), now, 90 * day)).toMatch(/ahead/);
    expect(readingTimeProblem(Date.parse('1960-01-01T00:00:00Z'), now, 90 * day)).toMatch(/behind/);
    expect(readingTimeProblem(now - 91 * day, now, 90 * day)).toMatch(/behind/);
  });

  it('topics round-trip and foreign topics are not ours', () => {
    const t = topics('KTP-FM-01');
    expect(parseTopic(t.telemetry)).toEqual({ serial: 'KTP-FM-01', channel: 'telemetry' });
    expect(parseTopic(t.result)).toEqual({ serial: 'KTP-FM-01', channel: 'result' });
    expect(parseTopic('thawline/v1/x/y/z')).toBe(null);
  });

  it('commands are a discriminated union', () => {
    expect(commandSchema.safeParse({ v: 1, id: 'c1', type: 'replay', fromSeq: 10, toSeq: 20 }).success).toBe(true);
    expect(commandSchema.safeParse({ v: 1, id: 'c1', type: 'heater', mode: 'forced-on', reason: '' }).success).toBe(
      false,
    );
  });
});
