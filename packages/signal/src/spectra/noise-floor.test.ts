import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { runningMedian } from './noise-floor.js';

/** Sorting each window: the slow, obvious median, as the independent check. */
function naiveRunningMedian(v: number[], width: number): number[] {
  const h = (width - 1) / 2;
  return v.map((_, i) => {
    const w = v.slice(Math.max(0, i - h), Math.min(v.length, i + h + 1)).sort((a, b) => a - b);
    return w.length % 2 ? w[(w.length - 1) / 2] : (w[w.length / 2 - 1] + w[w.length / 2]) / 2;
  });
}

describe('runningMedian', () => {
  it('ignores a narrow peak on a flat floor', () => {
    const v = new Float64Array(101).fill(1);
    v[50] = 1000;
    v[51] = 500;
    const m = runningMedian(v, 11);
    for (const x of m) expect(x).toBe(1);
  });

  it('equals the sorted-window median everywhere, edges included (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 200 }),
        fc.integer({ min: 0, max: 20 }),
        (values, h) => {
          const got = runningMedian(Float64Array.from(values), 2 * h + 1);
          const want = naiveRunningMedian(values, 2 * h + 1);
          want.forEach((w, i) => expect(got[i]).toBe(w));
        },
      ),
    );
  });

  it('rejects an even width', () => {
    expect(() => runningMedian(new Float64Array(4), 4)).toThrow(SignalInputError);
  });
});
