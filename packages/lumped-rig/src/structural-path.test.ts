import { describe, expect, it } from 'vitest';
import { createRandom } from './random.js';
import { diracAreas, mountAcceleration, resonanceResponse, resonatorWhiteNoiseVariance, type MountSpec } from './structural-path.js';

const mount: MountSpec = { housingMassKg: 80, frequencyHz: 20, dampingRatio: 0.08 };

describe('mountAcceleration', () => {
  it('reads the closed-form accelerance of an SDOF, |A| = r²/√((1−r²)² + (2ζr)²)·F/M, below, at and above the mount frequency (Thomson & Dahleh §3.1)', () => {
    const fs = 20_000;
    const h = 1 / fs;
    for (const r of [0.5, 1, 3]) {
      const f = r * mount.frequencyHz;
      const F = 100;
      const n = Math.round(8 / (mount.frequencyHz * mount.dampingRatio) * fs);
      const force = Float64Array.from({ length: n }, (_, k) => F * Math.sin(2 * Math.PI * f * k * h));
      const a = mountAcceleration(force, h, 0, mount);
      let peak = 0;
      for (let k = Math.floor(n / 2); k < n; k++) peak = Math.max(peak, Math.abs(a[k]!));
      const expected = (F / mount.housingMassKg) * (r * r) / Math.sqrt((1 - r * r) ** 2 + (2 * mount.dampingRatio * r) ** 2);
      expect(Math.abs(peak / expected - 1)).toBeLessThan(2e-3);
    }
  });

  it('gives no acceleration for a steady force (the mount takes it statically)', () => {
    const a = mountAcceleration(new Float64Array(1000).fill(5000), 1e-4, 0, mount);
    expect(Math.max(...a.map(Math.abs))).toBeLessThan(1e-9);
  });

  it('turns an impulse I into a velocity jump I/M of the housing (momentum), then free damped motion', () => {
    const h = 1e-4;
    const I = 0.4;
    const tau = 3.3 * h;
    const a = mountAcceleration(new Float64Array(3000), h, 0, mount, { timeS: Float64Array.of(tau), impulseNs: Float64Array.of(I) });
    // x = (v0/ω_d) e^(−ζωt) sin ω_d t with v0 = I/M; ẍ = −2ζω ẋ − ω² x (Thomson & Dahleh §2.6).
    const w = 2 * Math.PI * mount.frequencyHz;
    const sigma = mount.dampingRatio * w;
    const wd = w * Math.sqrt(1 - mount.dampingRatio ** 2);
    const v0 = I / mount.housingMassKg;
    for (let k = 4; k < 3000; k++) {
      const t = k * h - tau;
      const e = Math.exp(-sigma * t);
      const x = (v0 / wd) * e * Math.sin(wd * t);
      const v = v0 * e * (Math.cos(wd * t) - (sigma / wd) * Math.sin(wd * t));
      expect(a[k]! + 2 * sigma * v + w * w * x).toBeCloseTo(0, 9);
    }
  });
});

describe('resonanceResponse', () => {
  it('passes white noise with the variance ω σ² h / (4ζ) of a resonator (random-vibration closed form, Parseval): within 5 %', () => {
    const fs = 50_000;
    const h = 1 / fs;
    const f = 500; // ω·h = 0.063, where the closed form holds
    const zeta = 0.05;
    const random = createRandom(11);
    const n = 400_000;
    const x = Float64Array.from({ length: n }, () => random.normal());
    const y = resonanceResponse(x, h, 0, [{ frequencyHz: f, dampingRatio: zeta, weight: 1 }]);
    let ss = 0;
    for (let k = 20_000; k < n; k++) ss += y[k]! ** 2;
    const variance = ss / (n - 20_000);
    expect(Math.abs(variance / resonatorWhiteNoiseVariance(f, zeta, 1, h) - 1)).toBeLessThan(0.05);
  });

  it('rings each resonance after a Dirac of the housing: ω²·area/ω_d·e^(−ζωt)·sin(ω_d t), weighted', () => {
    const h = 1 / 48_000;
    const res = [
      { frequencyHz: 3000, dampingRatio: 0.05, weight: 0.7 },
      { frequencyHz: 9000, dampingRatio: 0.03, weight: 0.3 },
    ];
    const tau = 10.25 * h;
    const impulses = diracAreas({ timeS: Float64Array.of(tau), impulseNs: Float64Array.of(2) }, 50);
    const y = resonanceResponse(new Float64Array(400), h, 0, res, impulses);
    for (let k = 11; k < 400; k++) {
      const t = k * h - tau;
      let expected = 0;
      for (const r of res) {
        const w = 2 * Math.PI * r.frequencyHz;
        const wd = w * Math.sqrt(1 - r.dampingRatio ** 2);
        expected += r.weight * ((w * w * (2 / 50)) / wd) * Math.exp(-r.dampingRatio * w * t) * Math.sin(wd * t);
      }
      expect(y[k]).toBeCloseTo(expected, 6);
    }
    for (let k = 0; k <= 10; k++) expect(y[k]).toBe(0);
  });

  it('rejects weights that do not sum to 1', () => {
    expect(() => resonanceResponse(new Float64Array(4), 1e-4, 0, [{ frequencyHz: 100, dampingRatio: 0.1, weight: 0.5 }])).toThrow(/weights/);
  });
});
