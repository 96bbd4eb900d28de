import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { complexFft, complexSpectrumToReal, largestPowerOfTwoAtMost, realToComplexSpectrum, cachedPlanSizes } from './fft.js';

/** Direct O(N^2) DFT, X[k] = sum x[n] e^{-j 2 pi k n / N} (numpy.fft convention): the independent check. */
function directDft(data: Float64Array): Float64Array {
  const n = data.length / 2;
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let t = 0; t < n; t++) {
      const a = (-2 * Math.PI * ((k * t) % n)) / n;
      re += data[2 * t] * Math.cos(a) - data[2 * t + 1] * Math.sin(a);
      im += data[2 * t] * Math.sin(a) + data[2 * t + 1] * Math.cos(a);
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (const v of a) m = Math.max(m, Math.abs(v));
  return m;
}

describe('complexFft', () => {
  it('matches the direct DFT for power-of-two and other lengths (fft.js and Bluestein)', () => {
    for (const n of [1, 2, 3, 5, 8, 12, 100, 256, 1000, 1024]) {
      const data = new Float64Array(2 * n).map((_, i) => Math.sin(i * 1.37) + 0.5 * Math.cos(i * i * 0.01));
      const out = new Float64Array(2 * n);
      complexFft(n).forward(out, data);
      const ref = directDft(data);
      const scale = maxAbs(ref);
      for (let i = 0; i < 2 * n; i++) expect(Math.abs(out[i] - ref[i])).toBeLessThan(1e-11 * scale + 1e-12);
    }
  });

  it('inverts its own forward transform for any length (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 600 }), fc.integer(), (n, seed) => {
        const data = new Float64Array(2 * n).map((_, i) => Math.sin(seed + i * 0.731) * 3);
        const spec = new Float64Array(2 * n);
        const back = new Float64Array(2 * n);
        const plan = complexFft(n);
        plan.forward(spec, data);
        plan.inverse(back, spec);
        for (let i = 0; i < 2 * n; i++) expect(Math.abs(back[i] - data[i])).toBeLessThan(1e-10);
      }),
      { numRuns: 60 },
    );
  });
});

describe('realToComplexSpectrum', () => {
  it('returns the full Hermitian spectrum of a real record and inverts back', () => {
    for (const n of [16, 30, 1024, 999]) {
      const x = new Float64Array(n).map((_, i) => Math.cos(i * 0.3) + (i % 7) * 0.1);
      const X = realToComplexSpectrum(x);
      const data = new Float64Array(2 * n);
      x.forEach((v, i) => (data[2 * i] = v));
      const ref = directDft(data);
      for (let i = 0; i < 2 * n; i++) expect(X[i]).toBeCloseTo(ref[i], 9);
      const back = complexSpectrumToReal(X);
      for (let i = 0; i < n; i++) expect(back[i]).toBeCloseTo(x[i], 12);
    }
  });
});

describe('largestPowerOfTwoAtMost', () => {
  it('rounds down to a power of two', () => {
    expect(largestPowerOfTwoAtMost(1)).toBe(1);
    expect(largestPowerOfTwoAtMost(8191)).toBe(4096);
    expect(largestPowerOfTwoAtMost(8192)).toBe(8192);
  });
});

describe('complexFft plan cache', () => {
  it('keeps plans of every size in use, long-record sizes included (was: only up to 65,536 points)', () => {
    for (const size of [2 ** 18, 2 ** 20, 300_000]) expect(complexFft(size)).toBe(complexFft(size));
    expect(cachedPlanSizes()).toEqual(expect.arrayContaining([2 ** 18, 2 ** 20, 300_000]));
  });
});
