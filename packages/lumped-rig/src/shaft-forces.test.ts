import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { harmonicForce, misalignmentHarmonics, unbalanceHarmonics, unbalanceKgM } from './shaft-forces.js';

describe('unbalance', () => {
  it('gives the eccentricity of ISO 21940-11 grade G: e = G/Ω (G 6.3 at 3000 r/min is 20 µm, as the grade chart reads; from memory)', () => {
    const U = unbalanceKgM(1, 6.3, (3000 * 2 * Math.PI) / 60);
    expect(U * 1e6).toBeCloseTo(20.05, 1);
  });

  it('pulls with U·Ω²: four times the force at twice the speed (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e-2, noNaN: true }), fc.double({ min: 1, max: 100, noNaN: true }), (U, f) => {
        const [a] = unbalanceHarmonics(U, f, 0);
        const [b] = unbalanceHarmonics(U, 2 * f, 0);
        expect(b!.amplitudeN / a!.amplitudeN).toBeCloseTo(4, 10);
        expect(a!.amplitudeN).toBeCloseTo(U * (2 * Math.PI * f) ** 2, 6);
      }),
    );
  });
});

describe('harmonicForce', () => {
  it('equals Σ A cos(2π h f t + φ) evaluated directly, over 200 000 samples (the rotated phasor does not drift)', () => {
    const harmonics = [
      { order: 1, amplitudeN: 100, phaseRad: 0.3 },
      { order: 2.37, amplitudeN: 20, phaseRad: -1.1 },
    ];
    const f = 24.7;
    const h = 1 / 51_200;
    const x = harmonicForce(harmonics, f, -0.25, h, 200_000);
    let worst = 0;
    for (let k = 0; k < x.length; k += 7) {
      const t = -0.25 + k * h;
      const direct = harmonics.reduce((s, hm) => s + hm.amplitudeN * Math.cos(2 * Math.PI * hm.order * f * t + hm.phaseRad), 0);
      worst = Math.max(worst, Math.abs(x[k]! - direct));
    }
    expect(worst).toBeLessThan(1e-9);
  });
});

describe('misalignmentHarmonics', () => {
  it('scales the 1×, 2×, 3× radial and axial reactions with k·Δ', () => {
    const shares = { radial: [0.2, 0.3, 0.05] as [number, number, number], axial: [0.3, 0.2, 0.05] as [number, number, number] };
    const m = misalignmentHarmonics(2e6, 0.5e-3, shares, [0, 0, 0, 0, 0, 0]);
    expect(m.radial.map((h) => h.order)).toEqual([1, 2, 3]);
    expect(m.radial[1]!.amplitudeN).toBeCloseTo(300, 9);
    expect(m.axial[0]!.amplitudeN).toBeCloseTo(300, 9);
    expect(() => misalignmentHarmonics(0, 1e-3, shares, [])).toThrow(/couplingRadialStiffnessNPerM/);
  });
});
