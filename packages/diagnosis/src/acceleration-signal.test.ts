import { describe, expect, it } from 'vitest';
import { accelerationSignal, DIFFERENTIATION_TOP_HZ } from './acceleration-signal.js';

describe('accelerationSignal', () => {
  it('returns an acceleration channel unchanged', () => {
    const x = new Float64Array([1, 2, 3]);
    expect(accelerationSignal(x, 1000, 'g')).toEqual({ samples: x, unit: 'g' });
  });

  it('differentiates a velocity sine into a = 2πf·v (common practice), in m/s²', () => {
    const fs = 8192;
    const n = 16384;
    // 10 mm/s peak at 50 Hz gives 2π·50·0.01 = 3.14159 m/s² peak (check-values §8: 10 mm/s rms at 50 Hz is π m/s² rms).
    const v = Float64Array.from({ length: n }, (_, i) => 10 * Math.sin((2 * Math.PI * 50 * i) / fs));
    const a = accelerationSignal(v, fs, 'mm/s');
    expect(a.unit).toBe('m/s^2');
    let peak = 0;
    for (const s of a.samples) peak = Math.max(peak, Math.abs(s));
    expect(peak).toBeCloseTo(Math.PI, 3);
  });

  it('differentiates a displacement sine twice: a = (2πf)²·d', () => {
    const fs = 4096;
    const n = 8192;
    const d = Float64Array.from({ length: n }, (_, i) => 100 * Math.cos((2 * Math.PI * 32 * i) / fs)); // 100 µm
    const a = accelerationSignal(d, fs, 'um');
    let peak = 0;
    for (const s of a.samples) peak = Math.max(peak, Math.abs(s));
    expect(peak).toBeCloseTo((2 * Math.PI * 32) ** 2 * 100e-6, 3);
  });

  it('keeps only the velocity band when differentiating: a 5 kHz line above 1 kHz is dropped, 50 Hz stays a = 2πf·v', () => {
    // ISO 20816-1 / ISO 2954: velocity severity is specified over 10-1000 Hz; differentiation beyond it multiplies noise by 2πf.
    const fs = 25600;
    const n = 16384;
    const v = Float64Array.from({ length: n }, (_, i) => 10 * Math.sin((2 * Math.PI * 50 * i) / fs) + 0.5 * Math.sin((2 * Math.PI * 5000 * i) / fs));
    const a = accelerationSignal(v, fs, 'mm/s');
    let peak = 0;
    for (const s of a.samples) peak = Math.max(peak, Math.abs(s));
    // without the band the 5 kHz line alone would add 2π·5000·0.0005 = 15.7 m/s²
    expect(DIFFERENTIATION_TOP_HZ).toBe(1000);
    expect(peak).toBeCloseTo(Math.PI, 2);
  });
});
