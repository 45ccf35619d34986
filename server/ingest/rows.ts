import type { ControllerRow } from '@/server/repositories/controllers';
import type { ReadingRow } from '@/server/repositories/readings';
import { applyCalibration, atAntennaFromTransmitter, rfFromPowers } from '@/telemetry/math/rf';
import type { Reading } from '@/telemetry/wire';

/** A validated reading as a stored row: calibrated watts, and VSWR and return loss at the antenna. */
export function toRow(c: ControllerRow, r: Reading, boot: string, receivedAt: Date): ReadingRow {
  const { forwardW: fwd, reflectedW: refl } = applyCalibration(r.forwardW, r.reflectedW, {
    forwardScale: c.forward_scale,
    reflectedScale: c.reflected_scale,
    lineLossDb: c.line_loss_db,
  });
  const ant = atAntennaFromTransmitter(fwd, refl, c.line_loss_db);
  const rf = rfFromPowers(ant.forwardW, Math.min(ant.reflectedW, ant.forwardW));
  return {
    controller_id: c.id,
    boot,
    seq: r.seq,
    ts: new Date(r.ts),
    received_at: receivedAt,
    air_temp_c: r.airTempC,
    humidity_pct: r.humidityPct,
    moisture: r.moisture,
    forward_w: fwd,
    reflected_w: refl,
    vswr: rf.kind === 'ok' ? rf.vswr : null,
    return_loss_db: rf.kind === 'ok' && Number.isFinite(rf.returnLossDb) ? rf.returnLossDb : null,
    heater_mode: r.heater.mode,
    heater_on: r.heater.on,
    heater_current_a: r.heater.currentA,
    supply_volts: r.supply.volts,
    battery_pct: r.supply.batteryPct,
    flame_proven: r.flameProven,
  };
}

export function safeJson(b: Buffer): unknown {
  try {
    return JSON.parse(b.toString('utf8'));
  } catch {
    return null;
  }
}
