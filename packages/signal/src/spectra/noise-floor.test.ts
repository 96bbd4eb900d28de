import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { DEFAULT_NOISE_FLOOR_WIDTH_BINS, runningMedian } from './noise-floor.js';

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

  it('equals the sorted-window median on values with many ties and signed zeros, windows wider than the record included (property)', () => {
    // A stable sort keeps equal values (0 and -0 among them) in their original order, so the reference pins
    // down which zero a window's median is; few distinct values make every window full of ties.
    const value = fc.constantFrom(-0, 0, 1, -1, 2.5, 1e-300, -1e300);
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 300 }), fc.integer({ min: 0, max: 160 }), (values, h) => {
        const got = runningMedian(Float64Array.from(values), 2 * h + 1);
        const want = naiveRunningMedian(values, 2 * h + 1);
        want.forEach((w, i) => expect(Object.is(got[i], w)).toBe(true));
      }),
    );
  });

  it('equals the sorted-window median at the default noise-floor width on spectrum-like records (property)', () => {
    // Positive amplitudes over several decades with a few lines, as the noise floor of a spectrum sees them.
    const bin = fc.oneof(fc.double({ min: 1e-6, max: 1e-3, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }));
    fc.assert(
      fc.property(fc.array(bin, { minLength: 60, maxLength: 1500 }), (values) => {
        const got = runningMedian(Float64Array.from(values), DEFAULT_NOISE_FLOOR_WIDTH_BINS);
        const want = naiveRunningMedian(values, DEFAULT_NOISE_FLOOR_WIDTH_BINS);
        want.forEach((w, i) => expect(got[i]).toBe(w));
      }),
      { numRuns: 50 },
    );
  });

  it('rejects an even width', () => {
    expect(() => runningMedian(new Float64Array(4), 4)).toThrow(SignalInputError);
  });
});
