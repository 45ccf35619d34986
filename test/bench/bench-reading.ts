import type { Knex } from 'knex';

/** A reading of the wire contract for the benchmarks. */
export const reading = (seq: number, t: number, boot = 'bench') => ({
  v: 1,
  seq,
  boot,
  ts: new Date(t).toISOString(),
  airTempC: -2,
  humidityPct: 95,
  moisture: true,
  forwardW: 5000,
  reflectedW: 45,
  heater: { mode: 'auto', on: true, currentA: 17 },
  supply: { volts: 240, batteryPct: null },
  flameProven: null,
});

/**
 * The raw ceiling: 500-row INSERTs of the readings row shape into `readings` for
 * `ms`, through `db`; rows per second. The same figure every ingest benchmark
 * compares itself with.
 */
export async function rawInsertCeiling(db: Knex, controllerId: number, ms = 5000): Promise<number> {
  const rows = Array.from({ length: 500 }, (_, i) => ({
    controller_id: controllerId,
    boot: 'raw-ceiling',
    seq: i,
    ts: new Date(),
    received_at: new Date(),
    air_temp_c: -2,
    humidity_pct: 95,
    moisture: true,
    forward_w: 5000,
    reflected_w: 45,
    vswr: 1.21,
    return_loss_db: 20.4,
    heater_mode: 'auto',
    heater_on: true,
    heater_current_a: 17,
    supply_volts: 240,
    battery_pct: null,
    flame_proven: null,
  }));
  let written = 0;
  const t0 = Date.now();
  for (let k = 0; Date.now() - t0 < ms; k++) {
    await db('readings').insert(rows.map((r) => ({ ...r, seq: r.seq + k * 500 })));
    written += 500;
  }
  return written / ((Date.now() - t0) / 1000);
}
