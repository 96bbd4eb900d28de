import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { overallVelocityRms } from './overall-velocity.js';

const FS = 25600;
const sine = (amplitude: number, f: number, n = 1 << 17) =>
  new Float64Array(n).map((_, i) => amplitude * Math.sin((2 * Math.PI * f * i) / FS));

describe('overallVelocityRms', () => {
  it('gives 11.0364 mm/s for 1 g peak at 100 Hz in the 10-1000 Hz band', () => {
    // check-values.md section 8: 1 g peak at 100 Hz -> v_rms 11.0364 mm/s (v = a / (2 pi f), common practice)
    const r = overallVelocityRms(sine(1, 100), FS, 'g');
    expect(r.unit).toBe('mm/s');
    expect(r.bandHz).toEqual([10, 1000]);
    expect(Math.abs(r.velocityRmsMmPerS / 11.0364 - 1)).toBeLessThan(0.005);
    expect(r.rms).toBe(r.velocityRmsMmPerS);
  });

  it('leaves out lines outside the ISO 20816 band (5 Hz and 2500 Hz)', () => {
    const a = sine(1, 100);
    const out1 = sine(0.01, 5);
    const out2 = sine(5, 2500);
    for (let i = 0; i < a.length; i++) a[i] += out1[i] + out2[i];
    const r = overallVelocityRms(a, FS, 'g');
    expect(Math.abs(r.velocityRmsMmPerS / 11.0364 - 1)).toBeLessThan(0.005);
  });

  it('takes velocity records directly, in any velocity unit', () => {
    // 0.5 in/s peak = 12.7 mm/s peak = 8.98026 mm/s rms (1 in = 25.4 mm)
    const r = overallVelocityRms(sine(0.5, 60), FS, 'in/s');
    expect(Math.abs(r.velocityRmsMmPerS / (12.7 / Math.SQRT2) - 1)).toBeLessThan(0.005);
  });

  it('clips the band to the Nyquist frequency and says so in bandHz', () => {
    const fs = 1000;
    const a = new Float64Array(1 << 14).map((_, i) => Math.sin((2 * Math.PI * 100 * i) / fs));
    const r = overallVelocityRms(a, fs, 'g', { segmentLength: 1024 });
    expect(r.bandHz).toEqual([10, 500]);
    expect(Math.abs(r.velocityRmsMmPerS / 11.0364 - 1)).toBeLessThan(0.005);
  });

  it('refuses displacement channels and non-motion units', () => {
    expect(() => overallVelocityRms(sine(1, 100, 4096), FS, 'um')).toThrow(SignalInputError);
    expect(() => overallVelocityRms(sine(1, 100, 4096), FS, 'V')).toThrow(/not a known motion unit/);
  });
});
