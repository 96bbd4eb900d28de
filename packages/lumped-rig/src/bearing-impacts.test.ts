import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bearingImpacts, defectPeriodS, INNER_RACE_STRIKE_SHARE, loadZoneFraction, type BearingImpactSpec } from './bearing-impacts.js';
import { defectFrequenciesHz } from './bearing-kinematics.js';
import { createRandom } from './random.js';

const geometry = { rollingElements: 9, rollingElementDiameterMm: 7.94, pitchDiameterMm: 39.04, contactAngleDeg: 0 };
const base: BearingImpactSpec = {
  kind: 'outer-race',
  geometry,
  shaftSpeedHz: 29.95,
  elementKind: 'ball',
  radialLoadN: 2000,
  loadDistributionFactor: 0.5,
  spallLengthM: 0.5e-3,
  jitterFraction: 0.015,
  amplitudeScatter: 0.1,
  defectAngleRad: 0,
  startAngleRad: 0,
};

function intervals(t: Float64Array): number[] {
  return Array.from(t.subarray(1), (x, i) => x - t[i]!);
}

describe('bearingImpacts (Antoni & Randall 2003 cyclostationary model)', () => {
  it('strikes at BPFO on average, within the jitter: mean interval 1/BPFO ± 4σ/√N', () => {
    const train = bearingImpacts(base, 0, 20, createRandom(1));
    const T = 1 / defectFrequenciesHz(geometry, base.shaftSpeedHz).bpfoHz;
    const d = intervals(train.timeS);
    const mean = d.reduce((s, x) => s + x, 0) / d.length;
    const sigma = base.jitterFraction * T;
    expect(Math.abs(mean - T)).toBeLessThan((4 * sigma) / Math.sqrt(d.length));
    // The inter-arrival scatter is the jitter asked for (1-2 % in the model): sample σ within 10 % of it.
    const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (d.length - 1));
    expect(Math.abs(sd / sigma - 1)).toBeLessThan(0.1);
  });

  it('strikes at 2·BSF for a rolling-element defect, alternating a strong and a weak strike', () => {
    const train = bearingImpacts({ ...base, kind: 'rolling-element', loadDistributionFactor: 1, amplitudeScatter: 0 }, 0, 10, createRandom(2));
    expect(defectPeriodS('rolling-element', geometry, base.shaftSpeedHz)).toBeCloseTo(1 / (2 * defectFrequenciesHz(geometry, base.shaftSpeedHz).bsfHz), 15);
    // With ε = 1 the load zone spans the whole turn but still varies; neighbouring strikes differ by the race share.
    const d = intervals(train.timeS);
    const mean = d.reduce((s, x) => s + x, 0) / d.length;
    expect(Math.abs(mean * 2 * defectFrequenciesHz(geometry, base.shaftSpeedHz).bsfHz - 1)).toBeLessThan(0.005);
    // Divided by the load the element carries at each strike (its orbit angle 2π·FTF·t through the zone), the
    // impulses take two values in turn: the outer-race strike and the inner-race one at INNER_RACE_STRIKE_SHARE.
    const ftf = defectFrequenciesHz(geometry, base.shaftSpeedHz).ftfHz;
    const perLoad = Array.from(train.impulseNs, (x, i) => x / loadZoneFraction(2 * Math.PI * ftf * train.timeS[i]!, 1, 'ball'));
    for (let i = 0; i + 2 < perLoad.length; i++) {
      expect(perLoad[i + 2]! / perLoad[i]!).toBeCloseTo(1, 9);
      expect(Math.min(perLoad[i]!, perLoad[i + 1]!) / Math.max(perLoad[i]!, perLoad[i + 1]!)).toBeCloseTo(INNER_RACE_STRIKE_SHARE, 9);
    }
  });

  it('modulates an inner-race defect at the shaft rate: impacts only inside the load zone, strongest at its centre', () => {
    const spec = { ...base, kind: 'inner-race' as const, amplitudeScatter: 0, jitterFraction: 0.01 };
    const train = bearingImpacts(spec, 0, 10, createRandom(3));
    expect(train.timeS.length).toBeGreaterThan(0);
    let maxAtCentre = 0;
    for (let i = 0; i < train.timeS.length; i++) {
      const psi = 2 * Math.PI * spec.shaftSpeedHz * train.timeS[i]!;
      const c = Math.cos(psi);
      // ε = 0.5: the zone is the half turn with cos ψ > 0 (Harris & Kotzalas; from memory).
      expect(c).toBeGreaterThan(-1e-9);
      if (c > 0.99) maxAtCentre = Math.max(maxAtCentre, train.impulseNs[i]!);
    }
    expect(maxAtCentre).toBeGreaterThan(0);
    for (const x of train.impulseNs) expect(x).toBeLessThanOrEqual(maxAtCentre * 1.0001);
  });

  it('is deterministic for a seed and differs between seeds', () => {
    const a = bearingImpacts(base, 0, 2, createRandom(7));
    const b = bearingImpacts(base, 0, 2, createRandom(7));
    const c = bearingImpacts(base, 0, 2, createRandom(8));
    expect(Array.from(a.timeS)).toEqual(Array.from(b.timeS));
    expect(Array.from(a.timeS)).not.toEqual(Array.from(c.timeS));
  });

  it('names a bad argument', () => {
    expect(() => bearingImpacts({ ...base, jitterFraction: 0.5 }, 0, 1, createRandom(1))).toThrow(/jitterFraction/);
    expect(() => bearingImpacts(base, 1, 1, createRandom(1))).toThrow(/endS/);
  });
});

describe('loadZoneFraction (Stribeck load distribution)', () => {
  it('is 1 at the zone centre, 0 at ±90° for ε = 0.5, and q(ψ) = [1 − (1 − cos ψ)/(2ε)]^1.5 for balls in between', () => {
    expect(loadZoneFraction(0, 0.5, 'ball')).toBe(1);
    expect(loadZoneFraction(Math.PI / 2, 0.5, 'ball')).toBeCloseTo(0, 12);
    expect(loadZoneFraction(Math.PI / 3, 0.5, 'ball')).toBeCloseTo(0.5 ** 1.5, 12);
    expect(loadZoneFraction(Math.PI / 3, 0.5, 'roller')).toBeCloseTo(0.5 ** (10 / 9), 12);
  });

  it('lies in [0, 1] and falls with the angle from the centre (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: Math.PI, noNaN: true }), fc.double({ min: 0, max: Math.PI, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true }), (a, b, eps) => {
        const [lo, hi] = a < b ? [a, b] : [b, a];
        const qLo = loadZoneFraction(lo, eps, 'ball');
        const qHi = loadZoneFraction(hi, eps, 'ball');
        expect(qLo).toBeGreaterThanOrEqual(0);
        expect(qLo).toBeLessThanOrEqual(1);
        expect(qHi).toBeLessThanOrEqual(qLo + 1e-12);
      }),
    );
  });
});
