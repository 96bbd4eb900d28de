import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parkMiller, referenceSignal } from '../../../fixtures/diagnosis/reference-signal.js';
import { timeIndicators } from './time-indicators.js';

const reference = JSON.parse(readFileSync(new URL('../../../fixtures/diagnosis/reference.json', import.meta.url), 'utf8'));

function gaussian(count: number, seed: number): Float64Array {
  // Box & Muller (1958), Ann. Math. Statist. 29:610: two uniforms give two independent standard normals.
  const u = parkMiller(seed, 2 * count);
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = Math.sqrt(-2 * Math.log(u[2 * i]!)) * Math.cos(2 * Math.PI * u[2 * i + 1]!);
  return out;
}

describe('timeIndicators', () => {
  it('gives kurtosis 1.5 and crest factor √2 for a sine over whole periods (check-values §9, common practice)', () => {
    const x = Float64Array.from({ length: 10000 }, (_, i) => 3 * Math.sin((2 * Math.PI * i) / 100));
    const t = timeIndicators(x);
    expect(t.kurtosis).toBeCloseTo(1.5, 9);
    expect(t.crestFactor).toBeCloseTo(Math.SQRT2, 6);
    expect(t.rms).toBeCloseTo(3 / Math.SQRT2, 9);
    expect(t.peak).toBeCloseTo(3, 6);
  });

  it('gives kurtosis 3 for Gaussian noise (check-values §9), within 4 standard errors √(24/N)', () => {
    const n = 200_000;
    expect(Math.abs(timeIndicators(gaussian(n, 99)).kurtosis - 3)).toBeLessThan(4 * Math.sqrt(24 / n));
  });

  it('gives kurtosis 1 for a square wave (check-values §9)', () => {
    const x = Float64Array.from({ length: 1000 }, (_, i) => (i % 20 < 10 ? 1 : -1));
    expect(timeIndicators(x).kurtosis).toBeCloseTo(1, 12);
  });

  it('matches scipy.stats.kurtosis(fisher=False) and numpy rms / peak on the reference signal to 1e-9', () => {
    const t = timeIndicators(referenceSignal());
    expect(t.kurtosis).toBeCloseTo(reference.kurtosisPearson, 9);
    expect(Math.abs(t.rms / reference.rms - 1)).toBeLessThan(1e-9);
    expect(Math.abs(t.peak / reference.peak - 1)).toBeLessThan(1e-9);
  });

  it('is unchanged by an offset and a positive scale (crest factor and kurtosis are dimensionless)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 8, maxLength: 64 }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        (values, scale, offset) => {
          const a = timeIndicators(values);
          fc.pre(a.rms > 1e-3);
          const b = timeIndicators(values.map((v) => v * scale + offset));
          return Math.abs(a.kurtosis - b.kurtosis) < 1e-6 * Math.max(1, a.kurtosis) && Math.abs(a.crestFactor - b.crestFactor) < 1e-6 * Math.max(1, a.crestFactor);
        },
      ),
    );
  });

  it('returns zeros for a constant signal and rejects an empty one', () => {
    expect(timeIndicators([2, 2, 2])).toEqual({ peak: 0, rms: 0, crestFactor: 0, kurtosis: 0 });
    expect(() => timeIndicators([])).toThrow(/samples/);
  });
});
