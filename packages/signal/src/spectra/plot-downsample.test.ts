import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { downsampleForPlot } from './plot-downsample.js';

describe('downsampleForPlot', () => {
  it('keeps every bucket maximum, so a one-bin line survives', () => {
    const n = 4097;
    const values = new Float64Array(n).fill(1e-6);
    values[1234] = 3.5;
    const frequenciesHz = new Float64Array(n).map((_, k) => k * 3.125);
    const d = downsampleForPlot({ frequenciesHz, values }, 400);
    expect(d.values.length).toBeLessThanOrEqual(400);
    const i = d.values.indexOf(3.5);
    expect(d.frequenciesHz[i]).toBe(1234 * 3.125);
  });

  it('never exceeds maxPoints, keeps frequency order and the global max and min (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 3000 }),
        fc.integer({ min: 2, max: 500 }),
        (vals, maxPoints) => {
          const values = Float64Array.from(vals);
          const frequenciesHz = values.map((_, k) => k);
          const d = downsampleForPlot({ frequenciesHz, values }, maxPoints);
          expect(d.values.length).toBeLessThanOrEqual(Math.max(maxPoints, 0));
          for (let i = 1; i < d.frequenciesHz.length; i++) expect(d.frequenciesHz[i]).toBeGreaterThan(d.frequenciesHz[i - 1]);
          expect(Math.max(...d.values)).toBe(Math.max(...values));
          expect(Math.min(...d.values)).toBe(Math.min(...values));
        },
      ),
    );
  });

  it('rejects maxPoints below 2', () => {
    expect(() => downsampleForPlot({ frequenciesHz: new Float64Array(3), values: new Float64Array(3) }, 1)).toThrow(SignalInputError);
  });
});
