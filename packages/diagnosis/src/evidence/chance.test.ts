import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bayesFactorBound, chanceModel, chanceOfPeak, chiSquareSurvivalEven, correctedForSearch, evidenceOf, fisherCombined } from './chance.js';

// Reference values: scipy.stats.combine_pvalues(method='fisher') and scipy.stats.chi2.sf, made by
// fixtures/chance/make_reference.py (scipy 1.17.1).
const reference = JSON.parse(readFileSync(new URL('../../../../fixtures/chance/reference.json', import.meta.url), 'utf8')) as {
  fisher: Array<{ p: number[]; combined: number }>;
  chi2: Array<{ x: number; dof: number; sf: number }>;
};

describe('fisherCombined', () => {
  for (const c of reference.fisher) {
    it(`matches scipy's Fisher combination of [${c.p.join(', ')}]`, () => {
      expect(fisherCombined(c.p, c.p.length)).toBeCloseTo(c.combined, 10);
    });
  }

  it('counts lines looked for but not found as chance 1 (more lines predicted, weaker the same finds)', () => {
    expect(fisherCombined([0.001, 0.001], 2)).toBeLessThan(fisherCombined([0.001, 0.001], 6));
    expect(fisherCombined([], 5)).toBe(1);
  });
});

describe('chiSquareSurvivalEven', () => {
  for (const c of reference.chi2) {
    it(`matches scipy's chi2.sf(${c.x}, ${c.dof})`, () => {
      expect(chiSquareSurvivalEven(c.x, c.dof) / c.sf).toBeCloseTo(1, 9);
    });
  }

  it('stays accurate far into the tail, where the sum’s terms overflow a double (scipy: chi2.sf(600, 40) = 5.2502e-101)', () => {
    expect(chiSquareSurvivalEven(600, 40) / 5.2502004e-101).toBeCloseTo(1, 4);
  });
});

describe('bayesFactorBound', () => {
  // Sellke, Bayarri & Berger, Am. Stat. 55:62–71 (2001), table 1: p = 0.05, 0.01, 0.001 bound the Bayes factor by
  // 2.46, 7.99 and 53.3 (from memory of the table; the formula 1/(−e p ln p) gives them).
  it.each([[0.05, 2.46], [0.01, 7.99], [0.001, 53.3]])('bounds the Bayes factor of p = %s by %s', (p, b) => {
    expect(bayesFactorBound(p)).toBeCloseTo(b, 1);
  });

  it('gives no evidence at p >= 1/e', () => {
    expect(bayesFactorBound(0.5)).toBe(1);
  });
});

describe('evidenceOf', () => {
  it('reaches 0.5 where the Bayes factor bound reaches 50 (p ≈ 1e-3) and rises monotonically as p falls', () => {
    expect(evidenceOf(0.00105)).toBeGreaterThan(0.48);
    expect(evidenceOf(0.00105)).toBeLessThan(0.52);
    fc.assert(fc.property(fc.double({ min: 1e-30, max: 0.3, noNaN: true }), fc.double({ min: 1.01, max: 100, noNaN: true }), (p, f) => evidenceOf(p / f) >= evidenceOf(p)));
  });
});

describe('correctedForSearch', () => {
  it('is Šidák’s 1 − (1 − p)^n, accurate for small p', () => {
    expect(correctedForSearch(0.01, 10)).toBeCloseTo(1 - 0.99 ** 10, 12);
    expect(correctedForSearch(1e-12, 1000) / 1e-9).toBeCloseTo(1, 6);
    expect(correctedForSearch(0.2, 1)).toBe(0.2);
  });
});

describe('chanceOfPeak', () => {
  // A neighbourhood of peaks whose SNR in dB is exponential with mean 2 dB (an exponential tail in dB is the model's
  // own assumption; these figures are worked by hand from λ(s) = λ(u)·exp(−(s − u)/μ)).
  const peaks = Array.from({ length: 200 }, (_, i) => -2 * Math.log((i + 0.5) / 200)).sort((a, b) => b - a);
  const neighbourhood = { peakSnrDb: peaks, widthBins: 1000 };

  it('within the observed peaks, is the empirical density of peaks at least that strong over the window', () => {
    const s = peaks[60]!;
    const expected = 1 - Math.exp(-(61 / 1000) * 3);
    expect(chanceOfPeak(neighbourhood, s, 3)).toBeCloseTo(expected, 6);
  });

  it('beyond the strongest peaks, falls off by the fitted exponential tail rather than to zero', () => {
    const strongest = peaks[0]!;
    const p1 = chanceOfPeak(neighbourhood, strongest + 5, 3);
    const p2 = chanceOfPeak(neighbourhood, strongest + 10, 3);
    expect(p1).toBeGreaterThan(0);
    expect(p2).toBeLessThan(p1);
    // The same 5 dB step multiplies the density by the same factor exp(−5/μ).
    const p3 = chanceOfPeak(neighbourhood, strongest + 15, 3);
    expect(Math.log(p2 / p1)).toBeCloseTo(Math.log(p3 / p2), 2);
  });

  it('never claims a density under one peak per region when the region has too few peaks for a tail', () => {
    const sparse = { peakSnrDb: [12, 9, 7], widthBins: 100 };
    expect(chanceOfPeak(sparse, 40, 1)).toBeCloseTo(1 - Math.exp(-1 / 100), 9);
  });

  it('is monotonic: a stronger peak or a narrower window is never likelier by chance', () => {
    const model = chanceModel(neighbourhood);
    fc.assert(fc.property(fc.double({ min: -5, max: 60, noNaN: true }), fc.double({ min: 0, max: 20, noNaN: true }), fc.integer({ min: 1, max: 50 }), (s, d, w) => {
      return chanceOfPeak(model, s + d, w) <= chanceOfPeak(model, s, w) + 1e-15 && chanceOfPeak(model, s, w) <= chanceOfPeak(model, s, w + 1) + 1e-15;
    }));
  });
});
