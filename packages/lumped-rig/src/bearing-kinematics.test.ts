// Sources: the published CWRU 6205 and IMS ZA-2115 defect orders (docs/check-values.md §3); the kinematic identities of Randall & Antoni, MSSP 25:485-520 (2011).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { contactRollingSpeedsMPerS, defectFrequenciesHz } from './bearing-kinematics.js';

const INCH_MM = 25.4;

describe('defectFrequenciesHz', () => {
  it('reproduces the CWRU drive-end 6205 orders: BPFO 3.5848, BPFI 5.4152, FTF 0.39828, 2·BSF 4.7135 (check-values §3, 1e-4 relative)', () => {
    const f = defectFrequenciesHz({ rollingElements: 9, rollingElementDiameterMm: 0.3126 * INCH_MM, pitchDiameterMm: 1.537 * INCH_MM, contactAngleDeg: 0 }, 1);
    expect(f.bpfoHz / 3.5848 - 1).toBeLessThan(1e-4);
    expect(Math.abs(f.bpfiHz / 5.4152 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(f.ftfHz / 0.39828 - 1)).toBeLessThan(1e-4);
    expect(Math.abs((2 * f.bsfHz) / 4.7135 - 1)).toBeLessThan(1e-4);
  });

  it('reproduces the IMS ZA-2115 lines at 2000 r/min: BPFO 236.40, BPFI 296.93, FTF 14.775, BSF 139.92 Hz (check-values §3)', () => {
    const f = defectFrequenciesHz({ rollingElements: 16, rollingElementDiameterMm: 0.331 * INCH_MM, pitchDiameterMm: 2.815 * INCH_MM, contactAngleDeg: 15.17 }, 2000 / 60);
    expect(f.bpfoHz).toBeCloseTo(236.4, 1);
    expect(f.bpfiHz).toBeCloseTo(296.93, 1);
    expect(f.ftfHz).toBeCloseTo(14.775, 2);
    expect(f.bsfHz).toBeCloseTo(139.92, 1);
  });

  it('keeps the identities BPFO + BPFI = n·f_r and BPFO = n·FTF for any geometry (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 40 }),
        fc.double({ min: 2, max: 60, noNaN: true }),
        fc.double({ min: 1.2, max: 12, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: 0.1, max: 200, noNaN: true }),
        (n, d, ratio, angle, fr) => {
          const f = defectFrequenciesHz({ rollingElements: n, rollingElementDiameterMm: d, pitchDiameterMm: d * ratio, contactAngleDeg: angle }, fr);
          expect((f.bpfoHz + f.bpfiHz) / (n * fr)).toBeCloseTo(1, 10);
          expect(f.bpfoHz / (n * f.ftfHz)).toBeCloseTo(1, 10);
        },
      ),
    );
  });

  it('names a bad geometry', () => {
    expect(() => defectFrequenciesHz({ rollingElements: 9, rollingElementDiameterMm: 10, pitchDiameterMm: 8, contactAngleDeg: 0 }, 10)).toThrow(/pitchDiameterMm/);
    expect(() => defectFrequenciesHz({ rollingElements: 9, rollingElementDiameterMm: 8, pitchDiameterMm: 40, contactAngleDeg: 0 }, 0)).toThrow(/shaftSpeedHz/);
  });
});

describe('contactRollingSpeedsMPerS', () => {
  it('is the same at both races and on the element for a radial bearing: pure rolling has no slip at any contact (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 30 }), fc.double({ min: 3, max: 40, noNaN: true }), fc.double({ min: 1.5, max: 10, noNaN: true }), fc.double({ min: 1, max: 100, noNaN: true }), (n, d, ratio, fr) => {
        const v = contactRollingSpeedsMPerS({ rollingElements: n, rollingElementDiameterMm: d, pitchDiameterMm: d * ratio, contactAngleDeg: 0 }, fr);
        expect(v.innerRace / v.outerRace).toBeCloseTo(1, 10);
        expect(v.rollingElement / v.outerRace).toBeCloseTo(1, 10);
      }),
    );
  });
});
