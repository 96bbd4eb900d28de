import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { shaftAngleFromLaw } from './shaft-angle.js';
import { shaftSynchronousAverage, timeSynchronousAverage } from './synchronous-average.js';

const reference = JSON.parse(readFileSync(new URL('../../../../fixtures/angle/reference.json', import.meta.url), 'utf8'));

/** Seeded standard normal deviates: mulberry32 (Ettinger 2017) with Box & Muller (1958). */
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

describe('timeSynchronousAverage', () => {
  it('reduces white noise by 1/√N within 10 % for N = 4 … 256 (check-values §10, tsa_wav.py)', () => {
    // Braun (1975), McFadden (1987): uncorrelated noise falls as 1/√N in amplitude.
    const L = 256;
    const noise = normals(7);
    for (const N of [4, 16, 64, 256]) {
      let sum = 0;
      const trials = 20;
      for (let trial = 0; trial < trials; trial++) {
        const x = new Float64Array(L * N);
        for (let i = 0; i < x.length; i++) x[i] = Math.sin((2 * Math.PI * 3 * i) / L) + noise();
        const tsa = timeSynchronousAverage({ samples: x, samplesPerRev: L });
        let e = 0;
        for (let i = 0; i < L; i++) e += (tsa.average[i]! - Math.sin((2 * Math.PI * 3 * i) / L)) ** 2;
        sum += Math.sqrt(e / L);
      }
      const tsa = timeSynchronousAverage({ samples: new Float64Array(L * N), samplesPerRev: L });
      expect(tsa.averages).toBe(N);
      expect(tsa.noiseReductionFactor).toBeCloseTo(1 / Math.sqrt(N), 12);
      expect(Math.abs(sum / trials / (1 / Math.sqrt(N)) - 1)).toBeLessThan(0.1);
    }
  });

  it('passes a non-synchronous tone with the comb response |sin(NπfT)/(N·sin(πfT))| (check-values §10)', () => {
    const L = 64;
    const { averages, response } = reference.tsaComb;
    for (const { cyclesPerRev, gain } of response) {
      const x = new Float64Array(L * averages);
      // a tone of 1 + fT cycles per revolution: synchronous order 1 plus an offset fT that changes phase by 2π·fT each turn
      for (let i = 0; i < x.length; i++) x[i] = Math.cos((2 * Math.PI * (1 + cyclesPerRev) * i) / L);
      const avg = timeSynchronousAverage({ samples: x, samplesPerRev: L }).average;
      let re = 0;
      let im = 0;
      for (let i = 0; i < L; i++) {
        re += avg[i]! * Math.cos((2 * Math.PI * i) / L);
        im += avg[i]! * Math.sin((2 * Math.PI * i) / L);
      }
      // the average holds the order-1 line and a small order leak; project on order 1
      expect((2 * Math.hypot(re, im)) / L).toBeCloseTo(gain, 1);
    }
  });

  it('averages another shaft through the ratio: its own orders stay, the reference shaft’s fall by the comb response', () => {
    const fs = 8192;
    const n = fs * 8;
    const ratio = 18 / 67;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const thetaRef = 2 * Math.PI * 20 * (i / fs);
      x[i] = Math.cos(3 * ratio * thetaRef) + Math.cos(thetaRef);
    }
    const tsa = shaftSynchronousAverage(x, fs, shaftAngleFromLaw((t) => 20 * t, n, fs), ratio, { samplesPerRev: 256, maxOrder: 40 });
    const N = tsa.averages;
    expect(N).toBe(Math.floor(8 * 20 * ratio) - 1);
    // order 1 of the reference is order 67/18 = 3.722 of the averaged shaft; its residue after N turns is at most
    // 1/(N·|sin(π·0.722)|) (the comb response of check-values §10 between its lobes)
    const leak = 1 / (N * Math.abs(Math.sin(Math.PI * (67 / 18 - 3))));
    let worst = 0;
    for (let i = 0; i < 256; i++) worst = Math.max(worst, Math.abs(tsa.average[i]! - Math.cos((2 * Math.PI * 3 * i) / 256)));
    expect(worst).toBeLessThan(leak + 1e-3);
    expect(leak).toBeLessThan(0.05);
  });
});
