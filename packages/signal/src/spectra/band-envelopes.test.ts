import { describe, expect, it } from 'vitest';
import { BandEnvelopes, bandPaving } from './band-envelopes.js';

const FS = 25600;

/** Deterministic Gaussian noise (Box–Muller over a small LCG), so the checks do not move between runs. */
function gaussian(n: number, seed: number): Float64Array {
  let s = seed >>> 0;
  const u = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) + 0.5) / 4294967296;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  return out;
}

describe('bandPaving', () => {
  // Antoni 2007 (MSSP 21:108–124), 1/3-binary tree: level k holds 2^k bands of fs/2^(k+1); level k+0.6 holds 3·2^(k−1)
  // bands of fs/(3·2^k). The band touching 0 Hz is left out of each level.
  it('lays out the 1/3-binary tree level by level, without the bands at 0 Hz', () => {
    const bands = bandPaving(FS, { minBandwidthHz: FS / 16, topHz: FS / 2 });
    const count = (level: number) => bands.filter((b) => b.level === level).length;
    expect(count(1)).toBe(2 - 1);
    expect(count(1.6)).toBe(3 - 1);
    expect(count(2)).toBe(4 - 1);
    expect(count(2.6)).toBe(6 - 1);
    expect(count(3)).toBe(8 - 1);
    expect(bands.every((b) => b.lowHz > 0 && b.highHz <= FS / 2)).toBe(true);
    const level2 = bands.filter((b) => b.level === 2).map((b) => b.highHz - b.lowHz);
    expect(level2.every((w) => Math.abs(w - FS / 8) < 1e-9)).toBe(true);
  });
});

describe('BandEnvelopes', () => {
  it('reads an AM tone’s squared envelope at the modulation rate with its closed-form amplitudes', () => {
    // x = (1 + m cos 2π fm t) cos 2π fc t: its squared envelope (1 + m cos)² = 1 + m²/2 + 2m cos(fm) + (m²/2) cos(2fm)
    // (Randall & Antoni 2011, §3: the band's analytic signal gives the envelope); peak scaling reads 2m and m²/2.
    const n = 1 << 16;
    const fc = 4000;
    const fm = 100;
    const m = 0.5;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = (1 + m * Math.cos((2 * Math.PI * fm * i) / FS)) * Math.cos((2 * Math.PI * fc * i) / FS);
    const bank = new BandEnvelopes(x, FS);
    const { spectrum } = bank.analyseBand({ lowHz: 3200, highHz: 4800 }, { resolutionHz: 1 });
    const at = (hz: number) => {
      let best = 0;
      for (let k = 0; k < spectrum.frequenciesHz.length; k++) if (Math.abs(spectrum.frequenciesHz[k]! - hz) < 2) best = Math.max(best, spectrum.values[k]!);
      return best;
    };
    // fm and 2fm fall on bins here (the envelope's rate divided by its segment is a whole fraction of 100 Hz),
    // so the peak reading holds within the taper's small loss.
    expect(at(fm)).toBeCloseTo(2 * m, 1);
    expect(at(2 * fm)).toBeCloseTo((m * m) / 2, 1);
    expect(at(3 * fm)).toBeLessThan(0.01);
  });

  it('gives Gaussian noise a kurtosis near 0 and an impact train a large one; kurtosis alone agrees with the full analysis', () => {
    // Antoni 2007: the spectral kurtosis <|c|⁴>/<|c|²>² − 2 of a stationary Gaussian process is 0.
    const n = 1 << 16;
    const noise = gaussian(n, 7);
    const band = { lowHz: 3200, highHz: 6400 };
    const quiet = new BandEnvelopes(noise, FS);
    const k0 = quiet.bandKurtosis(band);
    expect(Math.abs(k0)).toBeLessThan(0.15);
    expect(quiet.analyseBand(band, { resolutionHz: 2 }).kurtosis).toBe(k0);
    // Decaying 5 kHz bursts every 10 ms: impulsive in the band they ring.
    const impacts = new Float64Array(noise.map((v) => 0.1 * v));
    for (let start = 0; start < n; start += 256) {
      for (let i = 0; i < 200 && start + i < n; i++) impacts[start + i]! += Math.exp(-i / 20) * Math.sin((2 * Math.PI * 5000 * i) / FS);
    }
    expect(new BandEnvelopes(impacts, FS).bandKurtosis(band)).toBeGreaterThan(2);
  });
});
