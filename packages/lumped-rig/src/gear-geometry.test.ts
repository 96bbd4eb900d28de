import { describe, expect, it } from 'vitest';
import { gearStageGeometry, SINGLE_PAIR_STIFFNESS_N_PER_MM_UM, solidDisc, type GearStageSpec } from './gear-geometry.js';

const spur: GearStageSpec = { meshId: 'm', pinionId: 'p', wheelId: 'g', pinionTeeth: 20, wheelTeeth: 40, moduleMm: 4, pressureAngleDeg: 20, helixAngleDeg: 0, faceWidthMm: 40 };

/**
 * Transverse contact ratio from the roll angles at the tips (an independent textbook form, e.g. Niemann & Winter,
 * Maschinenelemente II, or ISO 21771):  εα = [z1 (tan αa1 − tan αt) + z2 (tan αa2 − tan αt)] / (2π).
 */
function contactRatioFromRollAngles(z1: number, z2: number, mn: number, alphaNDeg: number, betaDeg: number): number {
  const beta = (betaDeg * Math.PI) / 180;
  const alphaT = Math.atan(Math.tan((alphaNDeg * Math.PI) / 180) / Math.cos(beta));
  const tip = (z: number) => {
    const r = (mn * z) / (2 * Math.cos(beta));
    const rb = r * Math.cos(alphaT);
    return Math.tan(Math.acos(rb / (r + mn)));
  };
  return (z1 * (tip(z1) - Math.tan(alphaT)) + z2 * (tip(z2) - Math.tan(alphaT))) / (2 * Math.PI);
}

describe('gearStageGeometry', () => {
  it('agrees with the roll-angle form of the transverse contact ratio, spur and helical', () => {
    for (const spec of [spur, { ...spur, pinionTeeth: 17, wheelTeeth: 59, moduleMm: 6 }, { ...spur, pinionTeeth: 23, wheelTeeth: 79, moduleMm: 3, helixAngleDeg: 15 }]) {
      const g = gearStageGeometry(spec);
      expect(g.transverseContactRatio).toBeCloseTo(contactRatioFromRollAngles(spec.pinionTeeth, spec.wheelTeeth, spec.moduleMm, spec.pressureAngleDeg, spec.helixAngleDeg), 10);
    }
  });

  it('puts standard 20° spur gears of 20 and 40 teeth between one and two pairs in contact (1.6-1.7, common practice)', () => {
    const g = gearStageGeometry(spur);
    expect(g.transverseContactRatio).toBeGreaterThan(1.6);
    expect(g.transverseContactRatio).toBeLessThan(1.7);
    expect(g.overlapContactRatio).toBe(0);
    // Base radius r_b = r cos α: 40 mm · cos 20° for the pinion.
    expect(g.baseRadiusPinionM).toBeCloseTo(0.04 * Math.cos((20 * Math.PI) / 180), 12);
  });

  it('gives εβ = b sin β / (π mn) and the ISO 6336-1 mean stiffness c′(0.75 εα + 0.25)·b', () => {
    const g = gearStageGeometry({ ...spur, helixAngleDeg: 15, faceWidthMm: 50, moduleMm: 3 });
    expect(g.overlapContactRatio).toBeCloseTo((50 * Math.sin((15 * Math.PI) / 180)) / (Math.PI * 3), 12);
    expect(g.meanMeshStiffnessNPerM).toBeCloseTo(SINGLE_PAIR_STIFFNESS_N_PER_MM_UM * (0.75 * g.transverseContactRatio + 0.25) * 50 * 1e6, 0);
  });

  it('names a bad parameter', () => {
    expect(() => gearStageGeometry({ ...spur, pinionTeeth: 5 })).toThrow(/pinionTeeth/);
    expect(() => gearStageGeometry({ ...spur, helixAngleDeg: 50 })).toThrow(/helixAngleDeg/);
  });
});

describe('solidDisc', () => {
  it('gives m = ρπr²b and J = m r²/2', () => {
    const { massKg, inertiaKgM2 } = solidDisc(0.1, 0.05);
    expect(massKg).toBeCloseTo(7850 * Math.PI * 0.01 * 0.05, 10);
    expect(inertiaKgM2).toBeCloseTo((massKg * 0.01) / 2, 12);
  });
});
