import { describe, expect, it } from 'vitest';
import { gearIndicators } from './gear-indicators.js';

function normals(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

const L = 4096;
const teeth = 23;
const mesh = (i: number) => Math.cos((2 * Math.PI * teeth * i) / L) + 0.4 * Math.cos((2 * Math.PI * 2 * teeth * i) / L + 0.7);

describe('gearIndicators', () => {
  it('gives FM0 = 2 for a pure mesh tone (peak-to-peak 2A over the one harmonic amplitude A)', () => {
    const avg = Float64Array.from({ length: L }, (_, i) => 0.8 * Math.cos((2 * Math.PI * teeth * i) / L));
    const g = gearIndicators(avg, { teeth, maxOrder: 100 });
    expect(g.meshHarmonicAmplitudes[0]).toBeCloseTo(0.8, 12);
    expect(g.fm0).toBeCloseTo(2, 9);
    // the regular signal is the mesh tone itself; residual and difference are empty
    g.regular.forEach((v, i) => expect(v).toBeCloseTo(avg[i]!, 9));
    expect(g.residualVariance).toBeLessThan(1e-20);
  });

  it('gives FM4 and NA4 near 3 for a healthy gear whose residual is Gaussian (Stewart 1977: kurtosis of a Gaussian)', () => {
    for (const seed of [1, 2, 3]) {
      const noise = normals(seed);
      const avg = Float64Array.from({ length: L }, (_, i) => mesh(i) + 0.05 * noise());
      const g = gearIndicators(avg, { teeth, maxOrder: 200 });
      // sampling spread of a kurtosis estimate from n samples is about √(24/n) = 0.077 here (common practice)
      expect(Math.abs(g.fm4 - 3)).toBeLessThan(0.3);
      expect(Math.abs(g.na4 - 3)).toBeLessThan(0.3);
      expect(g.meshHarmonicAmplitudes.length).toBe(Math.floor(200 / teeth));
    }
  });

  it('raises FM4 for a single-tooth defect: the mesh force drops over one tooth and the next one strikes', () => {
    const noise = normals(9);
    const pitch = L / teeth;
    const avg = Float64Array.from({ length: L }, (_, i) => {
      const inGap = i >= 1000 && i < 1000 + pitch;
      const sinceGap = i - (1000 + pitch);
      const ring = sinceGap >= 0 ? 0.6 * Math.exp(-sinceGap / 15) * Math.sin(sinceGap * 1.3) : 0;
      return mesh(i) * (inGap ? 0.2 : 1) + ring + 0.05 * noise();
    });
    const healthy = gearIndicators(Float64Array.from({ length: L }, (_, i) => mesh(i) + 0.05 * normals(9)()), { teeth, maxOrder: 200 });
    const faulty = gearIndicators(avg, { teeth, maxOrder: 200 });
    expect(faulty.fm4).toBeGreaterThan(2 * healthy.fm4);
    expect(faulty.na4).toBeGreaterThan(6);
  });

  it('normalises NA4 by the mean residual variance of the run history (Zakrajsek et al. 1993)', () => {
    const noise = normals(4);
    const avg = Float64Array.from({ length: L }, (_, i) => mesh(i) + 0.05 * noise());
    const alone = gearIndicators(avg, { teeth, maxOrder: 200 });
    // earlier records with a quarter of this residual variance: mean variance (3·v/4 + v)/4 = 7v/16
    const v = alone.residualVariance;
    const withHistory = gearIndicators(avg, { teeth, maxOrder: 200, residualVarianceHistory: [v / 4, v / 4, v / 4] });
    expect(withHistory.na4).toBeCloseTo(alone.na4 / (7 / 16) ** 2, 9);
  });

  it('refuses a mesh order above the band of the average', () => {
    expect(() => gearIndicators(new Float64Array(64), { teeth: 40 })).toThrowError(/above/);
  });
});
