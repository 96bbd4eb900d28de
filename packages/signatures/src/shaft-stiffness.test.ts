import { describe, expect, it } from 'vitest';
import { polarSecondMomentM4, shaftTorsionalStiffnessNmPerRad, STEEL_SHEAR_MODULUS_GPA } from './shaft-stiffness.js';

describe('shaftTorsionalStiffnessNmPerRad', () => {
  it('gives the worked numbers of check-values §5 for G = 79.3 GPa', () => {
    // k = Gπd⁴/(32L): Shigley Eq. 4-5 / Roark Table 10.1 case 1 (from memory); numbers from check-values.md §5 (mech.py).
    expect(shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000 })).toBeCloseTo(48657.9, 1);
    expect(shaftTorsionalStiffnessNmPerRad({ diameterMm: 25, lengthMm: 500 })).toBeCloseTo(6082.2, 1);
    expect(shaftTorsionalStiffnessNmPerRad({ diameterMm: 100, lengthMm: 2000 })).toBeCloseTo(389263.0, 0);
    expect(shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000, shearModulusGPa: 80 })).toBeCloseTo((48657.9 * 80) / 79.3, 1);
  });

  it('uses polar second moment πd⁴/32 = 6.135923e-7 m⁴ for d = 50 mm', () => {
    // check-values.md §5.
    expect(polarSecondMomentM4(50)).toBeCloseTo(6.135923e-7, 12);
  });

  it('takes steel at 79.3 GPa, the handbook value', () => {
    // Shigley Table A-5, carbon steel (from memory; check-values.md §5). Not derived from E and ν on purpose.
    expect(STEEL_SHEAR_MODULUS_GPA).toBe(79.3);
  });

  it('rejects a length or diameter that is not positive, naming it', () => {
    expect(() => shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 0 })).toThrow(/lengthMm/);
    expect(() => shaftTorsionalStiffnessNmPerRad({ diameterMm: -1, lengthMm: 10 })).toThrow(/diameterMm/);
    expect(() => shaftTorsionalStiffnessNmPerRad({ diameterMm: 10, lengthMm: 10, shearModulusGPa: NaN })).toThrow(/shearModulusGPa/);
  });
});
