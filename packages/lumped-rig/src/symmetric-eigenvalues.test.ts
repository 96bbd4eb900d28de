import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { symmetricEigenvalues } from './symmetric-eigenvalues.js';

describe('symmetricEigenvalues', () => {
  it('gives ω² = (3 ∓ √5)/2 for the fixed-free two-mass chain K = [[2, −1], [−1, 1]] (check-values §5)', () => {
    const [a, b] = symmetricEigenvalues([2, -1, -1, 1], 2);
    expect(a).toBeCloseTo((3 - Math.sqrt(5)) / 2, 12);
    expect(b).toBeCloseTo((3 + Math.sqrt(5)) / 2, 12);
  });

  it('gives 2 − 2cos(kπ/(n+1)) for the n × n fixed-fixed chain tridiag(−1, 2, −1) (a textbook closed form, e.g. Strang, Linear Algebra, §1.5)', () => {
    const n = 9;
    const m = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      m[i * n + i] = 2;
      if (i > 0) m[i * n + i - 1] = -1;
      if (i + 1 < n) m[i * n + i + 1] = -1;
    }
    const got = symmetricEigenvalues(m, n);
    const expected = Array.from({ length: n }, (_, k) => 2 - 2 * Math.cos(((k + 1) * Math.PI) / (n + 1)));
    got.forEach((v, i) => expect(v).toBeCloseTo(expected[i]!, 12));
  });

  it('keeps the trace and the Frobenius norm of any symmetric matrix (similarity invariants)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 8 }), fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 64, maxLength: 64 }), (n, raw) => {
        const m = new Float64Array(n * n);
        for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) m[i * n + j] = m[j * n + i] = raw[i * 8 + j]!;
        const ev = symmetricEigenvalues(m, n);
        let trace = 0;
        let frob = 0;
        for (let i = 0; i < n; i++) trace += m[i * n + i]!;
        for (const x of m) frob += x * x;
        expect(ev.reduce((s, x) => s + x, 0)).toBeCloseTo(trace, 8);
        expect(ev.reduce((s, x) => s + x * x, 0)).toBeCloseTo(frob, 6);
      }),
      { numRuns: 100 },
    );
  });

  it('rejects a non-symmetric matrix', () => {
    expect(() => symmetricEigenvalues([1, 2, 3, 4], 2)).toThrow(/symmetric/);
  });
});
