/**
 * Forward / reflected power arithmetic at a directional coupler.
 * |Γ| = √(Pr/Pf); VSWR = (1+|Γ|)/(1−|Γ|); return loss = 10·log10(Pf/Pr);
 * mismatch loss = −10·log10(1−|Γ|²). Definitions: Federal Standard 1037C
 * (reflection coefficient, standing-wave ratio), ECSS glossary (return loss).
 */

export type RfReading =
  | { kind: 'no-reading'; reason: 'transmitter-off' }
  | { kind: 'fault'; reason: 'reflected-not-below-forward' | 'negative-power' }
  | { kind: 'ok'; gamma: number; vswr: number; returnLossDb: number; mismatchLossDb: number; reflectedPct: number };

/** Forward power at or below this many watts counts as "transmitter off". */
export const defaultForwardFloorW = 0.5;

export function rfFromPowers(forwardW: number, reflectedW: number, forwardFloorW = defaultForwardFloorW): RfReading {
  if (!Number.isFinite(forwardW) || !Number.isFinite(reflectedW) || forwardW < 0 || reflectedW < 0) {
    return { kind: 'fault', reason: 'negative-power' };
  }
  if (forwardW <= forwardFloorW) return { kind: 'no-reading', reason: 'transmitter-off' };
  if (reflectedW >= forwardW) return { kind: 'fault', reason: 'reflected-not-below-forward' };
  const gamma = Math.sqrt(reflectedW / forwardW);
  return {
    kind: 'ok',
    gamma,
    vswr: vswrFromGamma(gamma),
    returnLossDb: reflectedW === 0 ? Infinity : 10 * Math.log10(forwardW / reflectedW),
    mismatchLossDb: mismatchLossDb(gamma),
    reflectedPct: (100 * reflectedW) / forwardW,
  };
}

function checkGamma(gamma: number) {
  if (!(gamma >= 0 && gamma < 1)) throw new RangeError('|Γ| must be at least 0 and below 1');
}

export function vswrFromGamma(gamma: number): number {
  checkGamma(gamma);
  return (1 + gamma) / (1 - gamma);
}

export function gammaFromVswr(vswr: number): number {
  if (!(vswr >= 1) || !Number.isFinite(vswr)) throw new RangeError('VSWR must be a finite number of at least 1');
  return (vswr - 1) / (vswr + 1);
}

export function returnLossFromGamma(gamma: number): number {
  checkGamma(gamma);
  return gamma === 0 ? Infinity : -20 * Math.log10(gamma);
}

export function gammaFromReturnLoss(returnLossDb: number): number {
  if (!(returnLossDb > 0)) throw new RangeError('Return loss must be above 0 dB');
  return 10 ** (-returnLossDb / 20);
}

export const vswrFromReturnLoss = (rl: number) => vswrFromGamma(gammaFromReturnLoss(rl));
export const returnLossFromVswr = (vswr: number) => returnLossFromGamma(gammaFromVswr(vswr));

export function mismatchLossDb(gamma: number): number {
  checkGamma(gamma);
  return -10 * Math.log10(1 - gamma * gamma);
}

/** Reflected power that a given VSWR means at a forward power. */
export function reflectedForVswr(forwardW: number, vswr: number): number {
  const g = gammaFromVswr(vswr);
  return forwardW * g * g;
}

/** Coupler calibration: raw readings times scale factors give watts at the coupler. */
export type CouplerCalibration = { forwardScale: number; reflectedScale: number; lineLossDb: number };

export function applyCalibration(rawForward: number, rawReflected: number, cal: CouplerCalibration) {
  return { forwardW: rawForward * cal.forwardScale, reflectedW: rawReflected * cal.reflectedScale };
}

/**
 * A coupler at the transmitter sees the antenna through the line: forward power
 * falls by the line loss on the way up, reflected power by it again on the way
 * back, so return loss at the transmitter = return loss at the antenna + 2 × line
 * loss (common practice). A lossy line hides a mismatch at the antenna.
 */
export function atAntennaFromTransmitter(forwardW: number, reflectedW: number, lineLossDb: number) {
  if (lineLossDb < 0) throw new RangeError('Line loss cannot be negative');
  const k = 10 ** (-lineLossDb / 10);
  return { forwardW: forwardW * k, reflectedW: reflectedW / k };
}

export function returnLossAtTransmitter(returnLossAtAntennaDb: number, lineLossDb: number): number {
  return returnLossAtAntennaDb + 2 * lineLossDb;
}

/** A VSWR as the trade writes it, "1.50:1"; "–" when there is none. */
export const vswrWords = (vswr: number | null | undefined): string => (vswr == null ? '–' : `${vswr.toFixed(2)}:1`);
