import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { welchSpectrum } from '../spectra/welch.js';
import { integrateSignal, integrateSpectrum } from './frequency-integration.js';

const rms = (x: Float64Array) => Math.sqrt(x.reduce((s, v) => s + v * v, 0) / x.length);
const peak = (x: Float64Array) => x.reduce((m, v) => Math.max(m, Math.abs(v)), 0);

describe('integrateSignal', () => {
  // check-values.md section 8 [CP/COMP]: v = a / (2 pi f), d = a / (2 pi f)^2; 1 g peak at 100 Hz gives
  // v_peak 15.6078 mm/s, v_rms 11.0364 mm/s, d_peak 24.8405 um
  for (const [fs, n] of [[25600, 25600], [32768, 32768]] as const) {
    it(`turns 1 g peak at 100 Hz into 11.0364 mm/s rms and 24.8405 um peak (${n} samples, fs ${fs})`, () => {
      const a = new Float64Array(n).map((_, i) => Math.sin((2 * Math.PI * 100 * i) / fs));
      const v = integrateSignal(a, fs, 'g', 'mm/s');
      expect(rms(v)).toBeCloseTo(11.0364, 4);
      expect(peak(v)).toBeCloseTo(15.6078, 3);
      // the integral of sin is -cos / w: the velocity lags the acceleration by 90 degrees
      for (let i = 0; i < 200; i++) expect(v[i]).toBeCloseTo((-15.60784 * Math.cos((2 * Math.PI * 100 * i) / fs)), 3);
      const d = integrateSignal(a, fs, 'g', 'um');
      expect(peak(d)).toBeCloseTo(24.8405, 3);
      const d2 = integrateSignal(v, fs, 'mm/s', 'um');
      for (let i = 0; i < 200; i++) expect(d2[i]).toBeCloseTo(d[i], 9);
    });
  }

  it('zeroes lines below the low-frequency cutoff', () => {
    const fs = 1024;
    const a = new Float64Array(4096).map((_, i) => Math.sin((2 * Math.PI * 1 * i) / fs) + Math.sin((2 * Math.PI * 50 * i) / fs));
    const v = integrateSignal(a, fs, 'm/s^2', 'm/s', { lowCutoffHz: 2 });
    // only the 50 Hz part survives: amplitude 1 / (2 pi 50)
    expect(peak(v)).toBeCloseTo(1 / (2 * Math.PI * 50), 9);
    const vAll = integrateSignal(a, fs, 'm/s^2', 'm/s', { lowCutoffHz: 0.5 });
    expect(peak(vAll)).toBeGreaterThan(0.15);
  });

  it('only rescales within one quantity, and refuses differentiation and bad cutoffs', () => {
    expect(Array.from(integrateSignal(Float64Array.from([1, 2]), 100, 'g', 'm/s^2'))).toEqual([9.80665, 19.6133]);
    expect(() => integrateSignal(new Float64Array(8), 100, 'mm/s', 'g')).toThrow(SignalInputError);
    expect(() => integrateSignal(new Float64Array(8), 100, 'g', 'mm/s', { lowCutoffHz: 0 })).toThrow(/lowCutoffHz/);
    expect(() => integrateSignal(new Float64Array(8), 100, 'V', 'mm/s')).toThrow(/not a known motion unit/);
  });
});

describe('integrateSpectrum', () => {
  it('divides a peak spectrum by 2 pi f: 1 g at 100 Hz reads 15.6078 mm/s peak', () => {
    // check-values.md section 8 (common practice v = a / (2 pi f)): 1 g peak at 100 Hz -> 15.6078 mm/s peak
    const fs = 25600;
    const a = new Float64Array(8 * 8192).map((_, i) => Math.sin((2 * Math.PI * 100 * i) / fs));
    const sa = welchSpectrum(a, fs, { window: 'flattop', segmentLength: 8192, scaling: 'peak', unit: 'g' });
    const sv = integrateSpectrum(sa, 'mm/s');
    expect(sv.unit).toBe('mm/s');
    expect(sv.valueUnit).toBe('mm/s');
    const k = 100 / sv.frequencyResolutionHz;
    expect(sv.values[k]).toBeCloseTo(15.6078, 3);
    const rmsV = integrateSpectrum(welchSpectrum(a, fs, { window: 'flattop', segmentLength: 8192, scaling: 'rms', unit: 'g' }), 'mm/s');
    expect(rmsV.values[k]).toBeCloseTo(11.0364, 3);
    const psdV = integrateSpectrum(welchSpectrum(a, fs, { segmentLength: 8192, scaling: 'psd', unit: 'g' }), 'mm/s');
    expect(psdV.valueUnit).toBe('(mm/s)^2/Hz');
    expect(sv.values[0]).toBe(0);
  });
});
