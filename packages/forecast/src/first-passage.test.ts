import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { firstPassageDensity, passageProbability, passageQuantile, passageTable, type FirstPassage } from './first-passage.js';
import { normalCdf } from './normal.js';

const reference = JSON.parse(readFileSync(new URL('../../../fixtures/forecast/first-passage-reference.json', import.meta.url), 'utf8')) as {
  cases: Array<FirstPassage & { quantiles?: Record<string, number>; cdfAt: Array<[number, number]> }>;
};

describe('normalCdf', () => {
  it('matches the table values Φ(0) = 0.5, Φ(1.96) = 0.975, Φ(−1) = 0.158655 (Abramowitz & Stegun 26.2)', () => {
    expect(normalCdf(0)).toBeCloseTo(0.5, 7);
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021, 6);
    expect(normalCdf(-1)).toBeCloseTo(0.1586553, 6);
  });
});

describe('first passage with a fixed drift', () => {
  it('is the inverse Gaussian: CDF Φ((μt − D)/σ√t) + e^(2μD/σ²) Φ(−(μt + D)/σ√t) (Chhikara & Folks 1989)', () => {
    const p: FirstPassage = { distance: 2, driftMeanPerS: 0.5, driftVarPerS2: 0, diffusionPerS: 0.2 };
    const table = passageTable(p, 40);
    for (const t of [1, 2, 4, 8, 16]) {
      const s = Math.sqrt(p.diffusionPerS * t);
      const closed = normalCdf((0.5 * t - 2) / s) + Math.exp((2 * 0.5 * 2) / 0.2) * normalCdf(-(0.5 * t + 2) / s);
      expect(passageProbability(table, t)).toBeCloseTo(closed, 4);
    }
  });

  it('gives the quantiles and CDF values scipy.stats.invgauss gives (fixtures/forecast/make_reference.py)', () => {
    for (const c of reference.cases.filter((x) => x.driftVarPerS2 === 0)) {
      const table = passageTable(c, 20 * (c.distance / c.driftMeanPerS));
      for (const [q, t] of Object.entries(c.quantiles!)) expect(passageQuantile(table, Number(q))! / t).toBeCloseTo(1, 3);
      for (const [t, f] of c.cdfAt) expect(passageProbability(table, t)).toBeCloseTo(f, 4);
    }
  });

  it('integrates to one over all time when the drift is positive', () => {
    const p: FirstPassage = { distance: 1, driftMeanPerS: 0.01, driftVarPerS2: 0, diffusionPerS: 0.001 };
    expect(passageProbability(passageTable(p, 1e6), 1e6)).toBeCloseTo(1, 4);
  });
});

describe('first passage with a random drift (Si et al. 2012)', () => {
  it('equals the mixture of inverse Gaussians over the drift, computed by quadrature in scipy', () => {
    for (const c of reference.cases.filter((x) => x.driftVarPerS2 > 0)) {
      const table = passageTable(c, 10 * (c.distance / c.driftMeanPerS));
      for (const [t, f] of c.cdfAt) expect(Math.abs(passageProbability(table, t) - f)).toBeLessThan(2e-4);
    }
  });

  it('reduces to the inverse Gaussian density as the drift variance goes to 0', () => {
    const fixed: FirstPassage = { distance: 1, driftMeanPerS: 0.02, driftVarPerS2: 0, diffusionPerS: 0.002 };
    const t = 40;
    // inverse Gaussian density D/√(2πσ²t³) exp(−(D − μt)²/(2σ²t))
    const ig = (1 / Math.sqrt(2 * Math.PI * 0.002 * t ** 3)) * Math.exp(-((1 - 0.02 * t) ** 2) / (2 * 0.002 * t));
    expect(firstPassageDensity(fixed, t)).toBeCloseTo(ig, 12);
  });

  it('leaves mass for never crossing when the drift may be negative, and passageQuantile says null beyond it', () => {
    const p: FirstPassage = { distance: 1, driftMeanPerS: 0, driftVarPerS2: 1e-6, diffusionPerS: 1e-4 };
    const table = passageTable(p, 1e4);
    expect(passageProbability(table, 1e4)).toBeLessThan(0.9);
    expect(passageQuantile(table, 0.99)).toBeNull();
  });
});
