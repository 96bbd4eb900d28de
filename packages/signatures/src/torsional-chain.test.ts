import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { shaftTorsionalStiffnessNmPerRad } from './shaft-stiffness.js';
import { chainMagnification, receptance, torsionalModes, type ChainSpring } from './torsional-chain.js';

interface FixtureCase {
  name: string;
  inertiasKgM2: number[];
  springs: ChainSpring[];
  beta: number;
  naturalFrequenciesHz: number[];
  receptance: Array<{ response: number; force: number; frequencyHz: number; re: number; im: number }>;
}
// scipy.linalg.eigh / numpy.linalg.solve reference vectors, made by fixtures/signatures/torsional_chain.py
const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/signatures/torsional-chain.json', import.meta.url), 'utf8')) as { cases: FixtureCase[] };

const absC = (c: { re: number; im: number }) => Math.hypot(c.re, c.im);

describe('torsionalModes', () => {
  it('gives the fixed–free two-inertia chain ω = 0.618034 and 1.618034 rad/s', () => {
    // m1 = m2 = 1, k1 = k2 = 1, K = [[2,−1],[−1,1]]: ω² = (3 ∓ √5)/2 (check-values.md §5).
    const modes = torsionalModes({ inertiasKgM2: [1, 1], springs: [{ from: 0, to: null, stiffnessNmPerRad: 1 }, { from: 0, to: 1, stiffnessNmPerRad: 1 }] }, { dampingRatio: 0.01 });
    expect(modes.rigidBodyModes).toBe(0);
    expect(modes.modes.map((m) => m.angularFrequencyRadPerS)).toEqual([expect.closeTo(0.618034, 6), expect.closeTo(1.618034, 6)]);
    // mass-normalised: φᵀJφ = 1
    for (const m of modes.modes) expect(m.shape[0]! ** 2 + m.shape[1]! ** 2).toBeCloseTo(1, 12);
  });

  it('gives a free two-disc chain a rigid-body mode at 0 Hz and √(k(J1+J2)/(J1·J2)) = 60.8075 Hz', () => {
    // J1 = 1, J2 = 0.5 on the 50 mm × 1 m steel shaft: check-values.md §5 (mech.py).
    const k = shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000 });
    const modes = torsionalModes({ inertiasKgM2: [1, 0.5], springs: [{ from: 0, to: 1, stiffnessNmPerRad: k }] }, { dampingRatio: 0.02 });
    expect(modes.rigidBodyModes).toBe(1);
    expect(modes.modes[0]!.rigidBody).toBe(true);
    expect(modes.modes[0]!.naturalFrequencyHz).toBe(0);
    expect(modes.naturalFrequenciesHz).toEqual([expect.closeTo(60.8075, 4)]);
    expect(modes.modes[1]!.angularFrequencyRadPerS).toBeCloseTo(382.065, 3);
    // rigid-body shape: both discs turn alike; flexible shape: the discs oppose with J1φ1 = −J2φ2 (momentum)
    expect(modes.modes[0]!.shape[0]).toBeCloseTo(modes.modes[0]!.shape[1]!, 12);
    expect(modes.modes[1]!.shape[0]! * 1 + modes.modes[1]!.shape[1]! * 0.5).toBeCloseTo(0, 12);
  });

  it('gives a disc on a shaft fixed at its far end √(k/J)', () => {
    // check-values.md §5: 35.1072 Hz for J = 1 kg·m² on the 50 mm × 1 m shaft.
    const k = shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000 });
    expect(torsionalModes({ inertiasKgM2: [1], springs: [{ from: 0, to: null, stiffnessNmPerRad: k }] }, { dampingRatio: 0.02 }).naturalFrequenciesHz[0]).toBeCloseTo(35.1072, 4);
  });

  for (const c of fixture.cases) {
    it(`matches scipy.linalg.eigh for the ${c.name}`, () => {
      const modes = torsionalModes(c, { dampingRatio: 0.01 });
      const ours = modes.modes.map((m) => m.naturalFrequencyHz);
      c.naturalFrequenciesHz.forEach((f, i) => expect(ours[i]).toBeCloseTo(f, 6));
    });
  }

  it('counts one rigid-body mode for each free part of the chain', () => {
    const modes = torsionalModes({ inertiasKgM2: [1, 2, 3, 4], springs: [{ from: 0, to: 1, stiffnessNmPerRad: 100 }, { from: 2, to: 3, stiffnessNmPerRad: 100 }] }, { dampingRatio: 0.05 });
    expect(modes.rigidBodyModes).toBe(2);
    expect(modes.naturalFrequenciesHz).toHaveLength(2);
  });

  it('applies modalDampingRatios to the flexible modes, lowest first, and dampingRatio to the rest', () => {
    const modes = torsionalModes({ inertiasKgM2: [1, 1, 1], springs: [{ from: 0, to: 1, stiffnessNmPerRad: 10 }, { from: 1, to: 2, stiffnessNmPerRad: 10 }] }, { dampingRatio: 0.03, modalDampingRatios: [0.1] });
    expect(modes.modes.map((m) => m.dampingRatio)).toEqual([0, 0.1, 0.03]);
  });

  it('rejects bad inertias, stiffnesses and node indices with the parameter named', () => {
    expect(() => torsionalModes({ inertiasKgM2: [1, 0], springs: [] }, { dampingRatio: 0.01 })).toThrow(/inertiasKgM2\[1\]/);
    expect(() => torsionalModes({ inertiasKgM2: [1, 1], springs: [{ from: 0, to: 2, stiffnessNmPerRad: 1 }] }, { dampingRatio: 0.01 })).toThrow(/springs\[0\]\.to/);
    expect(() => torsionalModes({ inertiasKgM2: [1, 1], springs: [{ from: 0, to: 1, stiffnessNmPerRad: -1 }] }, { dampingRatio: 0.01 })).toThrow(/stiffnessNmPerRad/);
    expect(() => torsionalModes({ inertiasKgM2: [1], springs: [] }, { dampingRatio: 1.5 })).toThrow(/dampingRatio/);
  });
});

describe('receptance', () => {
  it('gives the 2-DOF chain |H22| = 2, 153.264, 1.000200, 3.280169 at ω = 0, ω1, 1, ω2', () => {
    // Proportional damping C = 0.02·K ⇒ modal ζ = βω/2; reference |H| from numpy direct inversion, check-values.md §5.
    const chain = { inertiasKgM2: [1, 1], springs: [{ from: 0, to: null, stiffnessNmPerRad: 1 }, { from: 0, to: 1, stiffnessNmPerRad: 1 }] };
    const w1 = (Math.sqrt(5) - 1) / 2, w2 = (Math.sqrt(5) + 1) / 2;
    const modes = torsionalModes(chain, { dampingRatio: 0, modalDampingRatios: [0.02 * w1 / 2, 0.02 * w2 / 2] });
    const hz = (w: number) => w / (2 * Math.PI);
    const cases: Array<[number, number, number, number]> = [
      // ω, |H11|, |H21|, |H22|
      [0, 1, 1, 2],
      [w1, 58.546596, 94.718677, 153.264218],
      [1, 0.019988, 0.9996, 1.0002],
      [w2, 8.542597, 5.281323, 3.280169],
    ];
    for (const [w, h11, h21, h22] of cases) {
      expect(absC(receptance(modes, 0, 0, hz(w)))).toBeCloseTo(h11, 5);
      expect(absC(receptance(modes, 1, 0, hz(w)))).toBeCloseTo(h21, 5);
      expect(absC(receptance(modes, 1, 1, hz(w)))).toBeCloseTo(h22, 5);
    }
  });

  for (const c of fixture.cases) {
    it(`matches numpy's direct solve of (K − ω²J + jωβK)⁻¹ for the ${c.name}`, () => {
      const omegas = c.naturalFrequenciesHz.map((f) => 2 * Math.PI * f).filter((w) => w > 0);
      const modes = torsionalModes(c, { dampingRatio: 0, modalDampingRatios: omegas.map((w) => (c.beta * w) / 2) });
      for (const h of c.receptance) {
        const ours = receptance(modes, h.response, h.force, h.frequencyHz);
        const scale = Math.hypot(h.re, h.im);
        expect(Math.abs(ours.re - h.re)).toBeLessThan(1e-7 * scale);
        expect(Math.abs(ours.im - h.im)).toBeLessThan(1e-7 * scale + 1e-18);
      }
    });
  }

  it('is infinite at 0 Hz for a free chain (no static response to a steady torque)', () => {
    const modes = torsionalModes({ inertiasKgM2: [1, 2], springs: [{ from: 0, to: 1, stiffnessNmPerRad: 1000 }] }, { dampingRatio: 0.02 });
    expect(receptance(modes, 0, 0, 0).re).toBe(Infinity);
  });
});

describe('chainMagnification', () => {
  it('tends to 1 well below the first mode and peaks near 1/(2ζ) for a grounded disc', () => {
    // One disc on a grounded shaft is the SDOF oscillator: M(r) of Thomson & Dahleh §3.1 (from memory).
    const modes = torsionalModes({ inertiasKgM2: [2], springs: [{ from: 0, to: null, stiffnessNmPerRad: 8000 }] }, { dampingRatio: 0.05 });
    const fn = modes.naturalFrequenciesHz[0]!;
    expect(chainMagnification(modes, 0, 0, fn * 0.01)).toBeCloseTo(1, 3);
    expect(chainMagnification(modes, 0, 0, fn)).toBeCloseTo(10, 8);
    expect(chainMagnification(modes, 0, 0, 2 * fn)).toBeCloseTo(0.3326, 4);
  });

  it('is 1 well below the first flexible mode of a free chain (the chain turns as one body)', () => {
    const modes = torsionalModes({ inertiasKgM2: [1, 0.5], springs: [{ from: 0, to: 1, stiffnessNmPerRad: 48657.9 }] }, { dampingRatio: 0.02 });
    expect(chainMagnification(modes, 1, 0, 0.5)).toBeCloseTo(1, 3);
    expect(chainMagnification(modes, 1, 0, 60.8)).toBeGreaterThan(10);
  });
});
