import { describe, expect, it } from 'vitest';
import { bestPhmEstimate, percentError, phmAccuracy } from './phm2012-score.js';

// IEEE PHM 2012 prognostic challenge details, eq. 1-2: Er = 100 (actual − estimate)/actual;
// A = exp(−ln(0.5)·Er/5) for Er ≤ 0, exp(+ln(0.5)·Er/20) for Er > 0. Values below worked by hand.
describe('percentError and phmAccuracy (IEEE PHM 2012 challenge, eq. 1-2)', () => {
  const cases: Array<[actual: number, estimate: number, er: number, a: number]> = [
    [100, 100, 0, 1], // exact
    [100, 80, 20, 0.5], // early by 20 %: half
    [100, 105, -5, 0.5], // late by 5 %: half
    [100, 60, 40, 0.25], // early 40 %: 0.5²
    [100, 120, -20, 0.0625], // late 20 %: 0.5⁴
    [5730, 0, 100, 0.03125], // an estimate of 0: 0.5⁵
    [339, 339 * 1.1, -10, 0.25], // late 10 %: 0.5²
  ];
  for (const [actual, estimate, er, a] of cases) {
    it(`gives Er = ${er} % and A = ${a} for actual ${actual} s, estimate ${Number(estimate.toFixed(1))} s`, () => {
      expect(percentError(actual, estimate)).toBeCloseTo(er, 10);
      expect(phmAccuracy(percentError(actual, estimate))).toBeCloseTo(a, 10);
    });
  }

  it('refuses an actual life of zero', () => {
    expect(() => percentError(0, 10)).toThrow(RangeError);
  });
});

describe('bestPhmEstimate', () => {
  it('returns the life itself when the life is certain', () => {
    expect(bestPhmEstimate(() => 500)).toBeCloseTo(500, 6);
  });

  it('lies early of the median when the life is uncertain, since late estimates cost four times more', () => {
    // lives uniform on 500..1500 s: the median is 1000 s
    const e = bestPhmEstimate((q) => 500 + 1000 * q)!;
    expect(e).toBeLessThan(1000);
    expect(e).toBeGreaterThan(500);
  });
});
