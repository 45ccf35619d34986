import { type HeaterState, initialHeaterState, setHeaterMode, stepHeater } from '@/telemetry/math/heater';
import { freezingRainRadialIceMm } from '@/telemetry/math/icing';
import { gammaFromVswr, vswrFromGamma } from '@/telemetry/math/rf';
import type { Command, Reading } from '@/telemetry/wire';

import { noise, weatherAt } from './weather';

export type DeviceSpec = {
  serial: string;
  kind: 'heater' | 'blanket' | 'gas-heater' | 'radome-sensor';
  heaterKw: number;
  forwardW: number;
  offGrid: { batteryKwh: number } | null;
  seed: number;
  /** a heater that reports on but warms nothing (a failed element): ice builds, current reads 0 */
  faultyHeater?: boolean;
};

/**
 * One virtual site controller: its own heater logic (the same state machine the
 * server knows), ice that builds and sheds, a coupler with noise, and a buffer of
 * recent readings that it replays on request.
 */
export class VirtualController {
  seq = 0;
  /** a new boot id at every start, as a real device makes one at power-up */
  readonly boot = `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}`;
  iceMm = 0;
  batteryPct = 85;
  heater: HeaterState = initialHeaterState;
  private buffer: Reading[] = [];
  private lastSimMin: number | null = null;

  constructor(
    readonly spec: DeviceSpec,
    private bufferSize = 5000,
  ) {}

  /** Advances the model to `simMinutes` and returns the reading taken then. */
  sample(nowMs: number, simMinutes: number): Reading {
    const s = this.spec;
    const w = weatherAt(simMinutes, s.seed);
    const dtH = this.lastSimMin == null ? 0 : Math.max(0, simMinutes - this.lastSimMin) / 60;
    this.lastSimMin = simMinutes;
    const wet = w.precipMmH > 0.05;
    const hasHeater = s.kind !== 'radome-sensor';
    const canHeat = hasHeater && (!s.offGrid || this.batteryPct > 15);
    if (hasHeater)
      this.heater = stepHeater(this.heater, { nowMs: simMinutes * 60_000, airTempC: w.airTempC, moisture: wet }).state;
    const heating = this.heater.on && canHeat;
    const flameProven =
      s.kind === 'gas-heater' ? (heating ? noise(s.seed + 9, Math.floor(simMinutes / 10)) > -0.9 : false) : null;
    const effective = heating && !s.faultyHeater && (s.kind !== 'gas-heater' || flameProven === true);
    if (w.airTempC <= 0 && wet)
      this.iceMm +=
        freezingRainRadialIceMm([{ precipMmH: w.precipMmH, windMs: w.windMs }]) * dtH * (effective ? 0.1 : 1);
    const melt = (effective ? 4 : 0) + (w.airTempC > 0 ? (s.kind === 'radome-sensor' ? 0.3 : 1.5) * w.airTempC : 0);
    this.iceMm = Math.max(0, this.iceMm - melt * dtH);
    if (s.offGrid) {
      const drawKw = (heating ? s.heaterKw : 0) + 0.2;
      const sunKw = 0.15 * Math.max(0, Math.sin((Math.PI * (((simMinutes / 60) % 24) - 6)) / 12));
      this.batteryPct = Math.min(
        100,
        Math.max(0, this.batteryPct - ((drawKw - sunKw) * dtH * 100) / s.offGrid.batteryKwh),
      );
    }
    const step = Math.floor(nowMs / 1000);
    const baseVswr = 1.1 + 0.01 * noise(s.seed + 5, step);
    const vswr = baseVswr + 0.07 * this.iceMm * (s.kind === 'radome-sensor' ? 0.6 : 1);
    const g = gammaFromVswr(Math.min(vswr, vswrFromGamma(0.9)));
    const forwardW = s.forwardW * (1 + 0.003 * noise(s.seed + 6, step));
    // a resistive element draws its rated power at the supply it is on (a 48 V battery bus off grid, 240 V mains otherwise)
    const volts = s.offGrid ? round(48 + this.batteryPct * 0.06, 2) : round(240 + 2 * noise(s.seed + 7, step), 1);
    const reading: Reading = {
      v: 1,
      seq: this.seq++,
      boot: this.boot,
      ts: new Date(nowMs).toISOString(),
      airTempC: round(w.airTempC, 2),
      humidityPct: round(w.humidityPct, 1),
      moisture: wet,
      forwardW: round(forwardW, 2),
      reflectedW: round(forwardW * g * g, 4),
      heater: {
        mode: this.heater.mode,
        on: heating,
        currentA: hasHeater
          ? heating && s.kind !== 'gas-heater' && !s.faultyHeater
            ? round((s.heaterKw * 1000) / volts, 2)
            : 0
          : null,
      },
      supply: { volts, batteryPct: s.offGrid ? round(this.batteryPct, 1) : null },
      flameProven,
    };
    this.buffer.push(reading);
    if (this.buffer.length > this.bufferSize) this.buffer.shift();
    return reading;
  }

  /** Answers a command: readings to resend for a replay, or a heater mode change. */
  handle(cmd: Command, nowMs: number): { ok: boolean; message: string; replay: Reading[] } {
    if (cmd.type === 'replay') {
      if (cmd.boot && cmd.boot !== this.boot)
        return { ok: false, message: `boot ${cmd.boot} is gone (now ${this.boot})`, replay: [] };
      const replay = this.buffer.filter((r) => r.seq >= cmd.fromSeq && r.seq <= cmd.toSeq);
      return { ok: true, message: `replayed ${replay.length} of ${cmd.toSeq - cmd.fromSeq + 1}`, replay };
    }
    if (this.spec.kind === 'radome-sensor') return { ok: false, message: 'no heater on this controller', replay: [] };
    const until = cmd.until ? Date.parse(cmd.until) : null;
    // the heater logic runs on simulated minutes; a forced mode lasts its real duration
    this.heater = setHeaterMode(
      this.heater,
      cmd.mode,
      until == null ? null : (this.lastSimMin ?? 0) * 60_000 + (until - nowMs),
    );
    return { ok: true, message: `heater ${cmd.mode}`, replay: [] };
  }
}

const round = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;
