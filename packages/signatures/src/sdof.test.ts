import { describe, expect, it } from 'vitest';
import {
  dampedNaturalFrequencyHz, magnificationFactor, naturalFrequencyHz, normalisedReceptance, phaseLagRad, transmissibility,
} from './sdof.js';
import { shaftTorsionalStiffnessNmPerRad } from './shaft-stiffness.js';

const deg = (rad: number) => (rad * 180) / Math.PI;

describe('naturalFrequencyHz', () => {
  it('gives 35.1072 Hz and 49.6491 Hz for 1 and 0.5 kg·m² discs on a 50 mm × 1 m steel shaft', () => {
    // check-values.md §5 (mech.py): ω_n = √(k/J), k = Gπd⁴/(32L) with G = 79.3 GPa.
    const k = shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000 });
    expect(naturalFrequencyHz(k, 1)).toBeCloseTo(35.1072, 4);
    expect(naturalFrequencyHz(k, 0.5)).toBeCloseTo(49.6491, 4);
    expect(2 * Math.PI * naturalFrequencyHz(k, 1)).toBeCloseTo(220.585, 3);
  });

  it('gives 15.7609 Hz for a 1 mm static deflection (f_n = √(g/δ)/2π)', () => {
    // check-values.md §5: static-deflection rule (common practice), g_n = 9.80665 m/s² (CGPM 1901).
    expect(naturalFrequencyHz(9.80665 / 1e-3, 1)).toBeCloseTo(15.7609, 4);
  });

  it('rejects a stiffness or inertia that is not positive', () => {
    expect(() => naturalFrequencyHz(0, 1)).toThrow(/stiffness/);
    expect(() => naturalFrequencyHz(1, -2)).toThrow(/inertia/);
  });
});

describe('magnificationFactor', () => {
  // Thomson & Dahleh, Theory of Vibration with Applications, §3.1 (from memory); table from check-values.md §5.
  const table = [
    { zeta: 0.01, m1: 50, rPeak: 0.9999, mPeak: 50.0025, mHalf: 1.33321, phHalf: 0.764, m2: 0.3333, ph2: 179.236 },
    { zeta: 0.05, m1: 10, rPeak: 0.9975, mPeak: 10.01252, mHalf: 1.33038, phHalf: 3.814, m2: 0.3326, ph2: 176.186 },
    { zeta: 0.1, m1: 5, rPeak: 0.98995, mPeak: 5.02519, mHalf: 1.32164, phHalf: 7.595, m2: 0.33041, ph2: 172.405 },
    { zeta: 0.2, m1: 2.5, rPeak: 0.95917, mPeak: 2.55155, mHalf: 1.28831, phHalf: 14.931, m2: 0.32208, ph2: 165.069 },
    { zeta: 0.5, m1: 1, rPeak: 0.70711, mPeak: 1.1547, mHalf: 1.1094, phHalf: 33.69, m2: 0.27735, ph2: 146.31 },
  ];
  for (const row of table) {
    it(`matches the check-values table for ζ = ${row.zeta}`, () => {
      expect(magnificationFactor(1, row.zeta)).toBeCloseTo(row.m1, 3);
      expect(magnificationFactor(row.rPeak, row.zeta)).toBeCloseTo(row.mPeak, 4);
      expect(magnificationFactor(0.5, row.zeta)).toBeCloseTo(row.mHalf, 5);
      expect(magnificationFactor(2, row.zeta)).toBeCloseTo(row.m2, 5);
      expect(deg(phaseLagRad(0.5, row.zeta))).toBeCloseTo(row.phHalf, 3);
      expect(deg(phaseLagRad(2, row.zeta))).toBeCloseTo(row.ph2, 3);
      expect(deg(phaseLagRad(1, row.zeta))).toBeCloseTo(90, 10);
    });
  }

  it('peaks at 1/(2ζ√(1−ζ²)) at r = √(1−2ζ²)', () => {
    // Thomson & Dahleh §3.1 (from memory), check-values.md §5.
    for (const z of [0.02, 0.07, 0.3, 0.6]) {
      const rp = Math.sqrt(1 - 2 * z * z);
      expect(magnificationFactor(rp, z)).toBeCloseTo(1 / (2 * z * Math.sqrt(1 - z * z)), 10);
      expect(magnificationFactor(rp * 1.001, z)).toBeLessThan(magnificationFactor(rp, z));
      expect(magnificationFactor(rp * 0.999, z)).toBeLessThan(magnificationFactor(rp, z));
    }
  });

  it('has the half-power points r1 = 0.94611, r2 = 1.04636 at ζ = 0.05', () => {
    // check-values.md §5: half-power bandwidth Δr ≈ 2ζ.
    const peak = magnificationFactor(Math.sqrt(1 - 2 * 0.05 ** 2), 0.05);
    expect(magnificationFactor(0.94611, 0.05)).toBeCloseTo(peak / Math.SQRT2, 3);
    expect(magnificationFactor(1.04636, 0.05)).toBeCloseTo(peak / Math.SQRT2, 3);
  });

  it('agrees with the modulus and argument of the complex receptance', () => {
    const h = normalisedReceptance(1.3, 0.08);
    expect(Math.hypot(h.re, h.im)).toBeCloseTo(magnificationFactor(1.3, 0.08), 12);
    expect(-Math.atan2(h.im, h.re)).toBeCloseTo(phaseLagRad(1.3, 0.08), 12);
  });
});

describe('transmissibility', () => {
  it('is exactly 1 at r = √2 for every damping ratio', () => {
    // Thomson & Dahleh §3.5 (from memory); check-values.md §5 (0.9999999999999996 at ζ = 0.1 and 0.3).
    for (const z of [0.01, 0.1, 0.3, 0.7]) {
      const t = transmissibility(Math.SQRT2, z);
      expect(Math.hypot(t.re, t.im)).toBeCloseTo(1, 12);
    }
  });

  it('equals √(1 + (2ζr)²)·M', () => {
    for (const [r, z] of [[0.3, 0.05], [1, 0.1], [3, 0.2]] as const) {
      const t = transmissibility(r, z);
      expect(Math.hypot(t.re, t.im)).toBeCloseTo(Math.sqrt(1 + (2 * z * r) ** 2) * magnificationFactor(r, z), 12);
    }
  });
});

describe('dampedNaturalFrequencyHz', () => {
  it('gives ω_d/ω_n = 0.994987 at ζ = 0.1', () => {
    // check-values.md §5: ω_d = ω_n√(1−ζ²).
    expect(dampedNaturalFrequencyHz(1, 0.1)).toBeCloseTo(0.99498743710662, 12);
  });
});
