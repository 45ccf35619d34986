/**
 * The site controller's switching logic as a pure state machine, so the simulator
 * runs it and the server can replay it. Snow-melt / de-icing practice (common
 * practice): heat when moisture is present and the air is below about 3 °C; keep
 * heating for an adjustable after-run (about 30 min) once the moisture stops; shut
 * off above about 4 °C air (energy codes adopting IECC R403.9 require automatic
 * shut-off above 40 °F); an optional low-temperature cut-out.
 */
export type HeaterMode = 'auto' | 'forced-on' | 'forced-off';

export type HeaterSettings = {
  onBelowC: number;
  highCutoffC: number;
  afterRunMin: number;
  lowCutoutC: number | null;
};
export const defaultHeaterSettings: HeaterSettings = { onBelowC: 3, highCutoffC: 4, afterRunMin: 30, lowCutoutC: null };

export type HeaterState = {
  mode: HeaterMode;
  /** forced modes end here and return to auto */
  forcedUntilMs: number | null;
  on: boolean;
  lastCallMs: number | null;
};
export const initialHeaterState: HeaterState = { mode: 'auto', forcedUntilMs: null, on: false, lastCallMs: null };

export type HeaterInput = { nowMs: number; airTempC: number; moisture: boolean };
export type HeaterReason =
  'forced-on' | 'forced-off' | 'calling' | 'after-run' | 'high-temp-cutoff' | 'low-temp-cutout' | 'idle';

export function setHeaterMode(state: HeaterState, mode: HeaterMode, untilMs: number | null): HeaterState {
  return { ...state, mode, forcedUntilMs: mode === 'auto' ? null : untilMs };
}

export function stepHeater(
  state: HeaterState,
  input: HeaterInput,
  s: HeaterSettings = defaultHeaterSettings,
): { state: HeaterState; reason: HeaterReason } {
  let st = state;
  if (st.mode !== 'auto' && st.forcedUntilMs != null && input.nowMs >= st.forcedUntilMs)
    st = setHeaterMode(st, 'auto', null);
  if (st.mode === 'forced-on') return { state: { ...st, on: true }, reason: 'forced-on' };
  if (st.mode === 'forced-off') return { state: { ...st, on: false }, reason: 'forced-off' };
  const t = input.airTempC;
  if (t > s.highCutoffC) return { state: { ...st, on: false, lastCallMs: null }, reason: 'high-temp-cutoff' };
  if (s.lowCutoutC != null && t < s.lowCutoutC) return { state: { ...st, on: false }, reason: 'low-temp-cutout' };
  if (input.moisture && t < s.onBelowC)
    return { state: { ...st, on: true, lastCallMs: input.nowMs }, reason: 'calling' };
  if (st.lastCallMs != null && input.nowMs - st.lastCallMs < s.afterRunMin * 60_000) {
    return { state: { ...st, on: true }, reason: 'after-run' };
  }
  return { state: { ...st, on: false }, reason: 'idle' };
}
