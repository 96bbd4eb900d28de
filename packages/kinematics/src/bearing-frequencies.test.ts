import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bearingFaultOrders, bearingFaultOrdersFromGeometry } from './bearing-frequencies.js';
import type { Bearing } from './machine-model.js';

const INCH_MM = 25.4;

function relErr(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected);
}

describe('bearingFaultOrdersFromGeometry', () => {
  it('matches the CWRU drive-end 6205-2RS orders (CWRU lists 2×BSF as "rolling element")', () => {
    // CWRU Bearing Data Center, drive-end bearing 6205-2RS JEM SKF, defect frequencies as multiples of running speed
    // (engineering.case.edu/bearingdatacenter, via check-values §3): inner 5.4152, outer 3.5848, cage 0.39828,
    // rolling element 4.7135. Geometry n = 9, d = 0.3126 in, D = 1.537 in, φ = 0 (from memory; reproduces the table).
    const o = bearingFaultOrdersFromGeometry({
      rollingElements: 9, rollingElementDiameterMm: 0.3126 * INCH_MM, pitchDiameterMm: 1.537 * INCH_MM, contactAngleDeg: 0,
    });
    // CWRU rounds to 5 digits; its cage value differs in the 5th digit (0.39828 vs 0.39831), hence ~1e-4 relative.
    expect(relErr(o.bpfi, 5.4152)).toBeLessThan(1e-4);
    expect(relErr(o.bpfo, 3.5848)).toBeLessThan(1e-4);
    expect(relErr(o.ftf, 0.39828)).toBeLessThan(1e-4);
    expect(relErr(2 * o.bsf, 4.7135)).toBeLessThan(1e-4);
    // The CWRU value is not BSF itself: BSF alone is half of it.
    expect(relErr(o.bsf, 4.7135)).toBeGreaterThan(0.4);
  });

  it('matches the CWRU fan-end 6203-2RS orders', () => {
    // CWRU Bearing Data Center, fan-end 6203-2RS JEM SKF: inner 4.9469, outer 3.0530, cage 0.3817, rolling element 3.9874.
    // Geometry n = 8, d = 0.2656 in, D = 1.122 in (from memory; check-values §3 recomputes 4.9469 / 3.0531 / 0.38164 / 3.9877).
    const o = bearingFaultOrdersFromGeometry({
      rollingElements: 8, rollingElementDiameterMm: 0.2656 * INCH_MM, pitchDiameterMm: 1.122 * INCH_MM, contactAngleDeg: 0,
    });
    expect(relErr(o.bpfi, 4.9469)).toBeLessThan(1e-4);
    expect(relErr(o.bpfo, 3.053)).toBeLessThan(1e-4);
    expect(relErr(o.ftf, 0.3817)).toBeLessThan(2e-4);
    expect(relErr(2 * o.bsf, 3.9874)).toBeLessThan(1e-4);
  });

  it('matches the orders stated in the Curtin University bearing dataset readme', () => {
    // G. Forbes, Curtin University dataset readme (21/11/2012, CC-BY-4.0): 9 balls, ball 7.9375 mm, pitch 38.50 mm;
    // stated FTF 0.3969×, BPFO 3.572×, BPFI 5.428×, BSF 2.32× (BSF here is the once-per-spin value).
    const o = bearingFaultOrdersFromGeometry({ rollingElements: 9, rollingElementDiameterMm: 7.9375, pitchDiameterMm: 38.5, contactAngleDeg: 0 });
    expect(o.ftf).toBeCloseTo(0.3969, 4);
    expect(o.bpfo).toBeCloseTo(3.572, 3);
    expect(o.bpfi).toBeCloseTo(5.428, 3);
    expect(o.bsf).toBeCloseTo(2.32, 2);
  });

  it('gives the IMS/NASA Rexnord ZA-2115 frequencies at 2000 rpm (angular contact, φ = 15.17°)', () => {
    // Qiu, Lee, Lin & Yu (2006), J. Sound Vib. 289:1066-1090, IMS bearing test rig: Rexnord ZA-2115, 16 rollers,
    // d = 0.331 in, D = 2.815 in, φ = 15.17°, 2000 rpm. Geometry from memory; frequencies computed independently with numpy
    // in check-values §3: BPFO 236.40, BPFI 296.93, FTF 14.775, BSF 139.92 Hz (2×BSF 279.83).
    const o = bearingFaultOrdersFromGeometry({
      rollingElements: 16, rollingElementDiameterMm: 0.331 * INCH_MM, pitchDiameterMm: 2.815 * INCH_MM, contactAngleDeg: 15.17,
    });
    const frHz = 2000 / 60;
    expect(o.bpfo * frHz).toBeCloseTo(236.4, 1);
    expect(o.bpfi * frHz).toBeCloseTo(296.93, 1);
    expect(o.ftf * frHz).toBeCloseTo(14.775, 2);
    expect(o.bsf * frHz).toBeCloseTo(139.92, 1);
    expect(2 * o.bsf * frHz).toBeCloseTo(279.83, 1);
  });

  it('holds BPFO + BPFI = n and BPFO = n·FTF for any geometry', () => {
    // Randall & Antoni (2011), MSSP 25(2):485-520: both identities follow from the formulas (outer ring fixed).
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 40 }),
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 0.6, noNaN: true }),
        fc.double({ min: 0, max: 60, noNaN: true }),
        (n, pitchDiameterMm, dOverD, contactAngleDeg) => {
          const o = bearingFaultOrdersFromGeometry({
            rollingElements: n, rollingElementDiameterMm: dOverD * pitchDiameterMm, pitchDiameterMm, contactAngleDeg,
          });
          expect(o.bpfo + o.bpfi).toBeCloseTo(n, 9);
          expect(o.bpfo).toBeCloseTo(n * o.ftf, 9);
          // The cage turns slower than half the shaft speed; the outer race sees fewer passes than the inner one.
          expect(o.ftf).toBeLessThan(0.5);
          expect(o.bpfo).toBeLessThan(o.bpfi);
        },
      ),
    );
  });
});

describe('bearingFaultOrders', () => {
  it('returns the maker orders as given', () => {
    const bearing: Bearing = { id: 'b', shaft: 's', faultOrders: { bpfo: 4.38, bpfi: 6.62, bsf: 2.81, ftf: 0.398 } };
    expect(bearingFaultOrders(bearing)).toEqual({ bpfo: 4.38, bpfi: 6.62, bsf: 2.81, ftf: 0.398 });
  });

  it('uses the geometry with a contact angle of 0 when none is given', () => {
    const withAngle = bearingFaultOrders({ id: 'b', shaft: 's', rollingElements: 9, rollingElementDiameterMm: 7.94, pitchDiameterMm: 39.04, contactAngleDeg: 0 });
    const without = bearingFaultOrders({ id: 'b', shaft: 's', rollingElements: 9, rollingElementDiameterMm: 7.94, pitchDiameterMm: 39.04 });
    expect(without).toEqual(withAngle);
  });

  it('throws a RangeError naming the bearing when it has neither geometry nor orders', () => {
    expect(() => bearingFaultOrders({ id: 'lonely', shaft: 's' })).toThrow(/lonely/);
  });
});
