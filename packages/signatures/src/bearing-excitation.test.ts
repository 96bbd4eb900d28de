import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  cageExcitation, innerRaceExcitation, loadZoneSeries, outerRaceExcitation, rollingElementExcitation,
} from './bearing-excitation.js';

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
// CWRU drive-end 6205-2RS orders (check-values.md §3: CWRU bearing data centre; Randall & Antoni 2011 formulas).
const cwru = { bpfo: 3.5848, bpfi: 5.4152, bsf: 4.7135 / 2, ftf: 0.39828 };
// scipy.integrate.quad coefficients of cosⁿψ on |ψ| < 90°, made by fixtures/signatures/load_zone.py
const loadZone = JSON.parse(readFileSync(new URL('../../../fixtures/signatures/load-zone.json', import.meta.url), 'utf8')) as { cases: Array<{ exponent: number; c: number[] }> };

describe('outerRaceExcitation', () => {
  it('puts rectangular impacts at k·BPFO with amplitudes 2w·|sinc(k·w)| (non-integer order)', () => {
    // Pulse train c_k = (Aτ/T)·sinc(kτ/T)·e^{−jπkτ/T} (Oppenheim & Willsky Ex. 3.5, from memory; shift theorem).
    const w = 0.08;
    const ex = outerRaceExcitation({ orders: cwru, harmonics: 6, impact: { shape: 'rectangular', widthFraction: w } });
    expect(ex.domain).toBe('envelope');
    expect(ex.fundamentalOrder).toBe(3.5848);
    ex.lines.forEach((l, i) => {
      expect(l.order).toBeCloseTo((i + 1) * 3.5848, 12);
      expect(l.coefficient.amplitude).toBeCloseTo(2 * w * Math.abs(sinc((i + 1) * w)), 12);
      expect(l.coefficient.phaseRad).toBeCloseTo(-Math.PI * (i + 1) * w, 12);
    });
  });

  it('gives exponential impacts 2/|λ + j2πk|, the transform of one decaying pulse', () => {
    // Σ_k e^{−λ(θ+k)} on [0,1) has c_n = 1/(λ + j2πn) (Poisson summation of e^{−λt}u(t), elementary integral).
    const lambda = 12;
    const ex = outerRaceExcitation({ orders: cwru, harmonics: 5, impact: { shape: 'exponential', decayPerPeriod: lambda } });
    ex.lines.forEach((l, i) => expect(l.coefficient.amplitude).toBeCloseTo(2 / Math.hypot(lambda, 2 * Math.PI * (i + 1)), 12));
    expect(ex.mean).toBeCloseTo(1 / lambda, 12);
  });

  it('turns a resonance into the decay ζ·ω_r per defect period', () => {
    // Envelope of a ringing SDOF is e^{−ζω_r t} (Thomson & Dahleh §2.6, from memory).
    const fs = 29.95, fr = 3000, z = 0.04;
    const ex = outerRaceExcitation({ orders: cwru, harmonics: 2, shaftSpeedHz: fs, impact: { resonance: { frequencyHz: fr, dampingRatio: z } } });
    const lambda = (z * 2 * Math.PI * fr) / (3.5848 * fs);
    expect(ex.lines[0]!.coefficient.amplitude).toBeCloseTo(2 / Math.hypot(lambda, 2 * Math.PI), 12);
  });
});

describe('loadZoneSeries', () => {
  for (const { exponent, c } of loadZone.cases) {
    it(`matches scipy quad for the load zone cos^${exponent.toFixed(3)}ψ`, () => {
      const s = loadZoneSeries(exponent, 8);
      // n = 1 is closed form; other exponents are sampled, with aliasing of order N^−(n+1) (N = 65536)
      expect(Math.abs(s.a0 - c[0]!)).toBeLessThan(1e-9);
      for (let m = 1; m <= 8; m++) {
        expect(Math.abs(s.terms[m - 1]!.a / 2 - c[m]!)).toBeLessThan(1e-9);
        expect(s.terms[m - 1]!.b).toBeCloseTo(0, 9);
      }
    });
  }
});

describe('innerRaceExcitation', () => {
  it('puts p_k·q_m at k·BPFI + m·1× and the load-zone lines at 1×, 2×', () => {
    // Product of the impact train (at BPFI) and the half-wave load zone q = max(0, cos ψ) (n = 1):
    // convolution of the line spectra; half-wave rectified cosine c_0 = 1/π, c_1 = 1/4, c_2 = 1/(3π) (standard series).
    const w = 0.05;
    const ex = innerRaceExcitation({ orders: cwru, harmonics: 3, sidebands: 2, loadZoneExponent: 1, impact: { shape: 'rectangular', widthFraction: w } });
    const p = (k: number) => w * sinc(k * w);
    const q = [1 / Math.PI, 1 / 4, 1 / (3 * Math.PI)];
    const find = (order: number) => ex.lines.find((l) => Math.abs(l.order! - order) < 1e-9)!;
    for (let k = 1; k <= 3; k++) {
      for (let m = -2; m <= 2; m++) {
        expect(find(k * 5.4152 + m).coefficient.amplitude).toBeCloseTo(2 * p(k) * q[Math.abs(m)]!, 12);
        expect(find(k * 5.4152 + m).harmonic).toBe(k);
        expect(find(k * 5.4152 + m).sideband).toBe(m);
      }
    }
    expect(find(1).coefficient.amplitude).toBeCloseTo(2 * w * q[1]!, 12);
    expect(find(2).coefficient.amplitude).toBeCloseTo(2 * w * q[2]!, 12);
    expect(ex.modulationOrder).toBe(1);
    // lowest first, all positive
    const orders = ex.lines.map((l) => l.order!);
    expect([...orders].sort((a, b) => a - b)).toEqual(orders);
  });
});

describe('rollingElementExcitation', () => {
  it('puts impacts at 2×BSF with sidebands at FTF', () => {
    const ex = rollingElementExcitation({ orders: cwru, harmonics: 2, sidebands: 1 });
    expect(ex.fundamentalOrder).toBeCloseTo(4.7135, 12);
    const carriers = ex.lines.filter((l) => l.harmonic === 1).map((l) => l.order!);
    expect(carriers).toEqual([expect.closeTo(4.7135 - 0.39828, 12), expect.closeTo(4.7135, 12), expect.closeTo(4.7135 + 0.39828, 12)]);
  });
});

describe('cageExcitation', () => {
  it('puts lines at k·FTF only', () => {
    const ex = cageExcitation({ orders: cwru, harmonics: 4 });
    expect(ex.lines.map((l) => l.order)).toEqual([1, 2, 3, 4].map((k) => expect.closeTo(k * 0.39828, 12)));
  });

  it('rejects a missing order with its name', () => {
    expect(() => cageExcitation({ orders: { ...cwru, ftf: 0 } })).toThrow(/orders\.ftf/);
  });
});
