import { describe, expect, it } from 'vitest';
import { fromDisplacement, unitsPerSi } from './measured-quantity.js';

describe('fromDisplacement', () => {
  it('gives 1 g peak at 100 Hz for 24.8405 µm and 15.6078 mm/s peak', () => {
    // check-values.md §8 (numpy): 1 g peak at 100 Hz ⇒ v_peak = 15.6078 mm/s, d_peak = 24.8405 µm; g_n = 9.80665 m/s².
    const x = { re: 24.8405e-6, im: 0 };
    const a = fromDisplacement(x, 100, 'acceleration');
    expect(Math.hypot(a.re, a.im) * unitsPerSi('acceleration', 'g')).toBeCloseTo(1, 5);
    const v = fromDisplacement(x, 100, 'velocity');
    expect(Math.hypot(v.re, v.im) * unitsPerSi('velocity', 'mm/s')).toBeCloseTo(15.6078, 3);
    // velocity leads displacement by 90°, acceleration by 180°
    expect(Math.atan2(v.im, v.re)).toBeCloseTo(Math.PI / 2, 12);
    expect(Math.abs(Math.atan2(a.im, a.re))).toBeCloseTo(Math.PI, 12);
  });

  it('converts 10 mm/s at 50 Hz to 3.14159 m/s² = 0.32035 g', () => {
    // check-values.md §8.
    const x = { re: 10e-3 / (2 * Math.PI * 50), im: 0 };
    const a = fromDisplacement(x, 50, 'acceleration');
    expect(Math.hypot(a.re, a.im)).toBeCloseTo(Math.PI, 5);
    expect(Math.hypot(a.re, a.im) * unitsPerSi('acceleration', 'g')).toBeCloseTo(0.32035, 5);
  });
});

describe('unitsPerSi', () => {
  it('knows the point units of the machine model and mils of 25.4 µm', () => {
    expect(unitsPerSi('displacement', 'mil')).toBeCloseTo(39370.0787, 3);
    expect(unitsPerSi('velocity', 'in/s')).toBeCloseTo(39.3700787, 6);
    expect(() => unitsPerSi('velocity', 'furlong/s')).toThrow(/unit \('furlong\/s'\)/);
  });
});
