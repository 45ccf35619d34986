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
