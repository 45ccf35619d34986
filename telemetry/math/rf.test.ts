import { describe, expect, it } from 'vitest';

import {
  atAntennaFromTransmitter,
  gammaFromReturnLoss,
  gammaFromVswr,
  mismatchLossDb,
  reflectedForVswr,
  returnLossAtTransmitter,
  returnLossFromGamma,
  returnLossFromVswr,
  rfFromPowers,
  vswrFromGamma,
  vswrFromReturnLoss,
} from './rf';

describe('VSWR, |Γ| and return loss', () => {
  it('|Γ| = 1/3 gives VSWR 2', () => {
    // Worked example of the `vswr` reference page of a widely used RF toolbox: Γ = 1/3 → VSWR = 2.
    expect(vswrFromGamma(1 / 3)).toBeCloseTo(2, 12);
  });

  // Standing-wave conversion table values as printed in radio engineers' handbooks, each worked here by hand
  // from the Federal Standard 1037C definitions (no registry library carries them): |Γ| = (S − 1)/(S + 1),
  // RL = −20·log10|Γ|, reflected = |Γ|², ML = −10·log10(1 − |Γ|²). For S = 1.5: |Γ| = 0.5/2.5 = 0.2,
  // RL = 20·log10 5 = 13.98 dB, 4.0 %, ML = −10·log10 0.96 = 0.177 dB.
  const table = [
    { vswr: 1.5, gamma: 0.2, rl: 13.98, reflectedPct: 4.0, ml: 0.177 },
    { vswr: 2.0, gamma: 0.3333, rl: 9.54, reflectedPct: 11.1, ml: 0.512 },
    { vswr: 3.0, gamma: 0.5, rl: 6.02, reflectedPct: 25.0, ml: 1.249 },
    { vswr: 1.2, gamma: 0.0909, rl: 20.83, reflectedPct: 0.83, ml: 0.036 },
  ];
  for (const row of table) {
    it(`VSWR ${row.vswr}:1 → |Γ| ${row.gamma}, return loss ${row.rl} dB, ${row.reflectedPct} % reflected, mismatch loss ${row.ml} dB`, () => {
      const g = gammaFromVswr(row.vswr);
      expect(g).toBeCloseTo(row.gamma, 3);
      expect(returnLossFromVswr(row.vswr)).toBeCloseTo(row.rl, 2);
      expect(100 * g * g).toBeCloseTo(row.reflectedPct, 1);
      expect(mismatchLossDb(g)).toBeCloseTo(row.ml, 3);
    });
  }

  it('forward and reflected watts give the same figures as the definitions', () => {
    // 4 % reflected is VSWR 1.5:1 (the row worked by hand above).
    const r = rfFromPowers(1000, 40);
    expect(r.kind).toBe('ok');
    if (r.kind !== 'ok') return;
    expect(r.vswr).toBeCloseTo(1.5, 10);
    expect(r.returnLossDb).toBeCloseTo(13.98, 2);
    expect(r.reflectedPct).toBeCloseTo(4, 10);
  });

  it('guards the edges: transmitter off is no reading, reflected ≥ forward is a fault, never infinity', () => {
    expect(rfFromPowers(0, 0)).toEqual({ kind: 'no-reading', reason: 'transmitter-off' });
    expect(rfFromPowers(100, 100)).toEqual({ kind: 'fault', reason: 'reflected-not-below-forward' });
    expect(rfFromPowers(100, 150).kind).toBe('fault');
    expect(rfFromPowers(-1, 0).kind).toBe('fault');
    expect(rfFromPowers(Number.NaN, 0).kind).toBe('fault');
    const perfect = rfFromPowers(100, 0);
    expect(perfect.kind === 'ok' && perfect.vswr).toBe(1);
    expect(() => gammaFromVswr(0.9)).toThrow(RangeError);
    expect(() => vswrFromGamma(1)).toThrow(RangeError);
  });

  it('reflected watts for a VSWR limit invert the VSWR of those watts', () => {
    const pr = reflectedForVswr(5000, 2);
    const r = rfFromPowers(5000, pr);
    expect(r.kind === 'ok' && r.vswr).toBeCloseTo(2, 10);
  });
});

describe('round trips (property style over many values)', () => {
  // deterministic pseudo-random values so a failure can be reproduced
  let seed = 42;
  const next = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
  it('|Γ| → VSWR → |Γ| and |Γ| → return loss → |Γ| hold for 2000 values', () => {
    for (let i = 0; i < 2000; i++) {
      const g = next() * 0.999;
      expect(gammaFromVswr(vswrFromGamma(g))).toBeCloseTo(g, 9);
      if (g > 0) expect(gammaFromReturnLoss(returnLossFromGamma(g))).toBeCloseTo(g, 9);
      const vswr = 1 + next() * 20;
      expect(vswrFromReturnLoss(returnLossFromVswr(vswr))).toBeCloseTo(vswr, 6);
    }
  });
});

describe('line loss between transmitter and antenna', () => {
  it('return loss at the transmitter is that at the antenna plus twice the line loss (common practice)', () => {
    expect(returnLossAtTransmitter(14, 1.5)).toBe(17);
    // The same follows from carrying watts through the line both ways.
    const atTx = { f: 1000, r: 1000 * 10 ** (-17 / 10) };
    const atAnt = atAntennaFromTransmitter(atTx.f, atTx.r, 1.5);
    expect(10 * Math.log10(atAnt.forwardW / atAnt.reflectedW)).toBeCloseTo(14, 10);
  });

  it('3 dB of line loss halves the forward power (definition of the decibel)', () => {
    expect(atAntennaFromTransmitter(1000, 10, 3.0103).forwardW).toBeCloseTo(500, 1);
  });
});
