import { describe, expect, it } from 'vitest';
import { baseUnit, convertSpectrum } from './spectrum-quantity.js';

// v = a / (2πf) for harmonic motion (common practice). At f = 1000/(2π) Hz ≈ 159.155 Hz,
// 1 m/s² corresponds to exactly 1 mm/s; 1 g = 9.80665 m/s² (ISO 80000-3 standard gravity).
const f0 = 1000 / (2 * Math.PI);

describe('convertSpectrum', () => {
  it('turns 1 m/s² at 159.155 Hz into 1 mm/s and 1 g into 9.80665 mm/s', () => {
    const ms2 = convertSpectrum([0, f0], [5, 1], { quantity: 'acceleration', unit: 'm/s^2', scaling: 'peak' }, 'velocity');
    expect(ms2.unit).toBe('mm/s');
    expect(ms2.values[0]).toBe(0);
    expect(ms2.values[1]).toBeCloseTo(1, 12);
    const g = convertSpectrum([f0], [1], { quantity: 'acceleration', unit: 'g', scaling: 'rms' }, 'velocity');
    expect(g.values[0]).toBeCloseTo(9.80665, 10);
  });

  it('scales a PSD by the square of the factor', () => {
    const psd = convertSpectrum([f0 * 2], [4], { quantity: 'acceleration', unit: '(m/s²)²/Hz', scaling: 'psd' }, 'velocity');
    // amplitude factor at 2·f0 is 1/2, so the density factor is 1/4
    expect(psd.values[0]).toBeCloseTo(1, 12);
    expect(psd.unit).toBe('(mm/s)²/Hz');
  });

  it('turns 1 mm/s at 159.155 Hz back into 1 m/s²', () => {
    const a = convertSpectrum([f0], [1], { quantity: 'velocity', unit: 'mm/s', scaling: 'peak' }, 'acceleration');
    expect(a.values[0]).toBeCloseTo(1, 12);
    expect(a.unit).toBe('m/s²');
  });

  it('names the unit it cannot convert', () => {
    expect(() => convertSpectrum([1], [1], { quantity: 'acceleration', unit: 'V', scaling: 'peak' }, 'velocity')).toThrow(/unit \(V\)/);
  });
});

describe('baseUnit', () => {
  it('strips the density part of a unit', () => {
    expect(baseUnit('g²/Hz')).toBe('g');
    expect(baseUnit('(mm/s)^2/Hz')).toBe('mm/s');
    expect(baseUnit('m/s^2')).toBe('m/s^2');
  });
});
