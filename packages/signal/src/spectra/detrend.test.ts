import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { detrend } from './detrend.js';

describe('detrend', () => {
  it("removes the mean by default, as scipy's detrend type='constant'", () => {
    expect(Array.from(detrend(Float64Array.from([1, 2, 6])))).toEqual([-2, -1, 3]);
  });

  it('removes the least-squares line: [1, 2, 4] leaves [1/6, -1/3, 1/6]', () => {
    // worked by hand: mean 7/3, slope 3/2 about the centre index
    const r = detrend(Float64Array.from([1, 2, 4]), 'linear');
    [1 / 6, -1 / 3, 1 / 6].forEach((e, i) => expect(r[i]).toBeCloseTo(e, 14));
    const ramp = detrend(new Float64Array(100).map((_, i) => 3 + 0.25 * i), 'linear');
    for (const v of ramp) expect(Math.abs(v)).toBeLessThan(1e-12);
  });

  it("keeps the data with 'none' and rejects unknown modes", () => {
    expect(Array.from(detrend(Float64Array.from([1, 2]), 'none'))).toEqual([1, 2]);
    expect(() => detrend(new Float64Array(2), 'cubic' as never)).toThrow(SignalInputError);
  });
});
