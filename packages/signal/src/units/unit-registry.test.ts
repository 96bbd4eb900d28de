import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import {
  MOTION_UNITS,
  STANDARD_GRAVITY_M_PER_S2,
  canonicalUnit,
  convertUnit,
  normalizeUnit,
  quantityOfUnit,
  unitScaleFactor,
} from './unit-registry.js';

function errorCode(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(SignalInputError);
    return (e as SignalInputError).code;
  }
  return 'no error';
}

describe('convertUnit', () => {
  it('uses standard gravity 9.80665 m/s^2 for g', () => {
    // 3rd CGPM (1901), CR 70; ISO 80000-3; NIST SP 330 (check-values.md section 8)
    expect(STANDARD_GRAVITY_M_PER_S2).toBe(9.80665);
    expect(convertUnit(1, 'g', 'm/s^2')).toBe(9.80665);
    expect(convertUnit(1, 'g', 'mm/s^2')).toBeCloseTo(9806.65, 9);
  });

  it('gives 1 g = 386.089 in/s^2 through m/s^2 and the inch (ASA S1.1 annotation, check-values.md section 8)', () => {
    expect(convertUnit(1, 'g', 'm/s^2') / 0.0254).toBeCloseTo(386.089, 3);
  });

  it('converts velocity and displacement with the international inch (25.4 mm) and the mil (0.0254 mm)', () => {
    // 1 in = 25.4 mm exactly (1959 international yard and pound agreement; NIST SP 811)
    expect(convertUnit(1, 'in/s', 'mm/s')).toBeCloseTo(25.4, 12);
    expect(convertUnit(1, 'mils', 'um')).toBeCloseTo(25.4, 12);
    expect(convertUnit(1, 'mils', 'mm')).toBeCloseTo(0.0254, 14);
    expect(convertUnit(1, 'm/s', 'mm/s')).toBe(1000);
    expect(convertUnit(1000, 'um', 'mm')).toBeCloseTo(1, 14);
    expect(convertUnit(1, 'm', 'um')).toBeCloseTo(1e6, 6);
  });

  it('gives 10 mm/s rms at 50 Hz as 0.32035 g rms acceleration (check-values.md section 8)', () => {
    // a = v * 2 pi f for a sine (common practice); 10 mm/s at 50 Hz -> pi m/s^2 [COMP]
    const aMs2 = convertUnit(10, 'mm/s', 'm/s') * 2 * Math.PI * 50;
    expect(aMs2).toBeCloseTo(Math.PI, 12);
    expect(convertUnit(aMs2, 'm/s^2', 'g')).toBeCloseTo(0.32035, 5);
  });

  it('converts arrays element by element into a new array', () => {
    const x = Float64Array.from([1, -2, 0.5]);
    const y = convertUnit(x, 'g', 'm/s^2');
    expect(Array.from(y)).toEqual([9.80665, -19.6133, 4.903325]);
    expect(x[0]).toBe(1);
  });

  it('round-trips any value between any two units of one quantity (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...MOTION_UNITS),
        fc.constantFrom(...MOTION_UNITS),
        fc.double({ min: -1e6, max: 1e6, noNaN: true }),
        (a, b, v) => {
          if (quantityOfUnit(a) !== quantityOfUnit(b)) return;
          expect(convertUnit(convertUnit(v, a, b), b, a)).toBeCloseTo(v, 6);
        },
      ),
    );
  });

  it('refuses unknown units and conversions across quantities with typed errors', () => {
    expect(errorCode(() => convertUnit(1, 'furlong', 'm'))).toBe('unknown_unit');
    expect(errorCode(() => convertUnit(1, 'g', 'mm/s'))).toBe('incompatible_units');
    expect(() => unitScaleFactor('V', 'g')).toThrow(/'V' is not a known motion unit/);
  });
});

describe('quantityOfUnit', () => {
  it('names the quantity of each unit and accepts common spellings', () => {
    expect(quantityOfUnit('g')).toBe('acceleration');
    expect(quantityOfUnit('m/s2')).toBe('acceleration');
    expect(quantityOfUnit('mm/s')).toBe('velocity');
    expect(quantityOfUnit('ips')).toBe('velocity');
    expect(quantityOfUnit('µm')).toBe('displacement');
    expect(quantityOfUnit('mil')).toBe('displacement');
    expect(normalizeUnit(' m/s² ')).toBe('m/s^2');
    expect(canonicalUnit('counts')).toBeUndefined();
  });
});
