import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cubicSpline, evaluateSpline } from './cubic-spline.js';

describe('cubicSpline', () => {
  it('reproduces any cubic exactly, with its slope, on uneven knots (property)', () => {
    // The clamped spline with the end slopes of the interpolating cubic is exact on cubics (de Boor 1978, ch. IV).
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 4, maxLength: 4 }),
        fc.array(fc.double({ min: 0.05, max: 1, noNaN: true }), { minLength: 4, maxLength: 40 }),
        (c, gaps) => {
          const p = (x: number) => c[0]! + c[1]! * x + c[2]! * x * x + c[3]! * x * x * x;
          const dp = (x: number) => c[1]! + 2 * c[2]! * x + 3 * c[3]! * x * x;
          const xs = [0];
          for (const g of gaps) xs.push(xs[xs.length - 1]! + g);
          const spline = cubicSpline(Float64Array.from(xs), Float64Array.from(xs.map(p)));
          const at = Float64Array.from({ length: 50 }, (_, k) => Math.min(xs[xs.length - 1]!, (xs[xs.length - 1]! * k) / 49));
          const { values, slopes } = evaluateSpline(spline, at, true);
          return Array.from(at).every((x, k) => Math.abs(values[k]! - p(x)) < 1e-8 * (1 + Math.abs(p(x))) && Math.abs(slopes![k]! - dp(x)) < 1e-6 * (1 + Math.abs(dp(x))));
        },
      ),
      { numRuns: 100 },
    );
  });

  it('returns NaN outside its knots and rejects knots that do not increase', () => {
    const s = cubicSpline(Float64Array.from([0, 1, 2]), Float64Array.from([0, 1, 4]));
    expect(evaluateSpline(s, Float64Array.from([-0.1, 2.1])).values.every(Number.isNaN)).toBe(true);
    expect(() => cubicSpline(Float64Array.from([0, 1, 1]), Float64Array.from([0, 1, 2]))).toThrowError(/increase/);
  });
});
