import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gearStageGeometry, type GearStageSpec } from './gear-geometry.js';
import { SPUR_ENTRY_RAMP_PITCHES, ToothPairMesh, type ToothPairMeshSpec } from './tooth-pair-mesh.js';

const spurSpec: GearStageSpec = { meshId: 'm', pinionId: 'p', wheelId: 'g', pinionTeeth: 20, wheelTeeth: 47, moduleMm: 4, pressureAngleDeg: 20, helixAngleDeg: 0, faceWidthMm: 40 };

function mesh(spec: GearStageSpec, patch: Partial<ToothPairMeshSpec> = {}): ToothPairMesh {
  const g = gearStageGeometry(spec);
  return new ToothPairMesh({
    geometry: g,
    pinionTeeth: spec.pinionTeeth,
    wheelTeeth: spec.wheelTeeth,
    meanDampingNsPerM: 0,
    pinionToothStiffness: new Float64Array(spec.pinionTeeth).fill(1),
    wheelToothStiffness: new Float64Array(spec.wheelTeeth).fill(1),
    pinionPitchDeviationM: new Float64Array(spec.pinionTeeth),
    wheelPitchDeviationM: new Float64Array(spec.wheelTeeth),
    tipReliefM: 0,
    reliefLengthPitches: 0.5,
    pinionWearM: new Float64Array(spec.pinionTeeth),
    wheelWearM: new Float64Array(spec.wheelTeeth),
    ...patch,
  });
}

function meanOver(f: (u: number) => number, from: number, to: number, n = 200_000): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += f(from + ((i + 0.5) / n) * (to - from));
  return s / n;
}

describe('ToothPairMesh', () => {
  it('averages ISO 6336-1 cγα·b over a mesh cycle, spur and helical', () => {
    for (const spec of [spurSpec, { ...spurSpec, helixAngleDeg: 15, moduleMm: 3, faceWidthMm: 50 }]) {
      const m = mesh(spec);
      expect(meanOver((u) => m.stiffnessNPerM(u), 0, spec.pinionTeeth) / m.meanStiffnessNPerM).toBeCloseTo(1, 4);
    }
  });

  it('alternates one and two pairs in a spur mesh, two pairs for εα − 1 of each cycle (the meaning of the contact ratio)', () => {
    const m = mesh(spurSpec);
    const eps = gearStageGeometry(spurSpec).transverseContactRatio;
    const twoPairs = meanOver((u) => (m.stiffnessNPerM(u) > 1.5 * m.peakPairStiffnessNPerM ? 1 : 0), 0, 20);
    // The short entry ramps of SPUR_ENTRY_RAMP_PITCHES move the threshold crossing by half a ramp at each end.
    expect(Math.abs(twoPairs - (eps - 1))).toBeLessThan(SPUR_ENTRY_RAMP_PITCHES);
  });

  it('loses all contact for 2 − εγ of a pitch when a spur pinion tooth is missing, once per pinion turn', () => {
    const stiffness = new Float64Array(20).fill(1);
    stiffness[7] = 0;
    const m = mesh(spurSpec, { pinionToothStiffness: stiffness });
    const zeroShare = meanOver((u) => (m.stiffnessNPerM(u) === 0 ? 1 : 0), 0, 20, 400_000) * 20;
    expect(zeroShare).toBeCloseTo(2 - m.contactPitches, 3);
    // Periodic in the pinion's tooth count: a turn later the same gap.
    expect(m.stiffnessNPerM(7 + m.contactPitches - 0.95 + 0.3)).toBe(m.stiffnessNPerM(27 + m.contactPitches - 0.95 + 0.3));
  });

  it('lowers the stiffness only while the cracked tooth is in contact', () => {
    const cracked = new Float64Array(20).fill(1);
    cracked[3] = 0.5;
    const m = mesh(spurSpec, { pinionToothStiffness: cracked });
    const sound = mesh(spurSpec);
    for (let u = 0; u < 20; u += 0.013) {
      const inContact = u > 3 && u < 3 + m.contactPitches;
      if (inContact) expect(m.stiffnessNPerM(u)).toBeLessThanOrEqual(sound.stiffnessNPerM(u));
      else expect(m.stiffnessNPerM(u)).toBeCloseTo(sound.stiffnessNPerM(u), 6);
    }
  });

  it('never pulls and never softens with more approach, whatever the deviations (property)', () => {
    const helical = { ...spurSpec, helixAngleDeg: 12 };
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: -2e-5, max: 1e-4, noNaN: true }),
        fc.double({ min: 0, max: 5e-5, noNaN: true }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.integer({ min: 0, max: 2 ** 31 }),
        (u, approach, extra, rate, seed) => {
          let x = seed;
          const rnd = () => ((x = (Math.imul(x, 1103515245) + 12345) >>> 0) / 2 ** 32 - 0.5) * 1e-5;
          const m = mesh(helical, {
            meanDampingNsPerM: 2e4,
            pinionPitchDeviationM: Float64Array.from({ length: 20 }, rnd),
            wheelPitchDeviationM: Float64Array.from({ length: 47 }, rnd),
            tipReliefM: 8e-6,
          });
          const f1 = m.forceN(u, approach, 0);
          const f2 = m.forceN(u, approach + extra, 0);
          expect(f1).toBeGreaterThanOrEqual(0);
          expect(f2).toBeGreaterThanOrEqual(f1);
          expect(m.forceN(u, approach, rate)).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('rejects tooth arrays of the wrong length', () => {
    expect(() => mesh(spurSpec, { pinionToothStiffness: new Float64Array(19) })).toThrow(/pinionTeeth/);
  });
});
