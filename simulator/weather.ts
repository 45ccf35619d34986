/**
 * Invented weather that ebbs and flows through storms, deterministic per site
 * (a seed) and time. Simulated time runs `speed` times faster than the clock so
 * that a demo storm passes in minutes.
 */
export type Weather = { airTempC: number; humidityPct: number; precipMmH: number; windMs: number };

/** Small deterministic noise in [-1, 1] from a seed and a step. */
export function noise(seed: number, step: number): number {
  let x = (seed * 374761393 + step * 668265263) | 0;
  x = (x ^ (x >>> 13)) * 1274126177;
  x ^= x >>> 16;
  return ((x >>> 0) / 4294967295) * 2 - 1;
}

export function weatherAt(simMinutes: number, seed: number, periodMin = 120): Weather {
  const phase = (simMinutes + seed * 37) / periodMin;
  const f = phase - Math.floor(phase);
  const step = Math.floor(simMinutes);
  // cold in the middle of each cycle, near freezing at its ends
  const airTempC = 1.2 - 5 * Math.sin(Math.PI * f) + 0.3 * noise(seed, step);
  const stormy = f > 0.25 && f < 0.7;
  const envelope = stormy ? Math.sin((Math.PI * (f - 0.25)) / 0.45) : 0;
  const precipMmH = Math.max(0, envelope * (2.5 + noise(seed + 1, step)));
  const humidityPct = Math.min(
    100,
    stormy ? 93 + 5 * envelope + noise(seed + 2, step) : 76 + 8 * noise(seed + 3, step),
  );
  const windMs = Math.max(0, 6 + 6 * envelope + 2 * noise(seed + 4, step));
  return { airTempC, humidityPct, precipMmH, windMs };
}
