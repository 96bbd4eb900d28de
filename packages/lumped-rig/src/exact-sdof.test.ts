// Source: closed forms of the damped SDOF (Thomson & Dahleh, Theory of Vibration with Applications, textbook, below).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ExactSdof } from './exact-sdof.js';

// Closed forms of the viscously damped SDOF ÿ + 2ζω ẏ + ω² y = ω² u (W. T. Thomson & M. D. Dahleh, Theory of
// Vibration with Applications, 5th ed., §2.6 free damped vibration, §3.1 harmonic forcing; S. S. Rao, Mechanical
// Vibrations, §2.6 and §4.5 step response).
function freeResponse(y0: number, v0: number, w: number, z: number, t: number): number {
  const sigma = z * w;
  const wd = w * Math.sqrt(1 - z * z);
  return Math.exp(-sigma * t) * (y0 * Math.cos(wd * t) + ((v0 + sigma * y0) / wd) * Math.sin(wd * t));
}

describe('ExactSdof', () => {
  it('matches the closed-form damped free vibration at every step, for any step size', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 5000, noNaN: true }),
        fc.double({ min: 0.005, max: 0.5, noNaN: true }),
        fc.double({ min: 1e-6, max: 1e-2, noNaN: true }),
        fc.double({ min: -1, max: 1, noNaN: true }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        (fHz, zeta, h, y0, v0) => {
          const s = new ExactSdof(fHz, zeta, h);
          s.y = y0;
          s.v = v0;
          const w = 2 * Math.PI * fHz;
          const scale = Math.abs(y0) + Math.abs(v0) / w + 1e-12;
          for (let k = 1; k <= 50; k++) {
            s.step(0, 0);
            expect(Math.abs(s.y - freeResponse(y0, v0, w, zeta, k * h))).toBeLessThan(1e-9 * scale);
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  it('gives the closed-form unit step response y = 1 − e^(−ζωt)(cos ω_d t + ζω/ω_d sin ω_d t)', () => {
    const fHz = 120;
    const zeta = 0.05;
    const h = 1e-4;
    const s = new ExactSdof(fHz, zeta, h);
    const w = 2 * Math.PI * fHz;
    let worst = 0;
    for (let k = 1; k <= 2000; k++) {
      s.step(1, 1);
      worst = Math.max(worst, Math.abs(s.y - (1 + freeResponse(-1, 0, w, zeta, k * h))));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('reaches the magnification factor 1/√((1−r²)² + (2ζr)²) under a sampled sine (check-values §5: M(0.5) = 1.33038 at ζ = 0.05)', () => {
    const cases = [
      { r: 0.5, zeta: 0.05, expected: 1.33038 },
      { r: 1, zeta: 0.05, expected: 10.0 },
      { r: 2, zeta: 0.1, expected: 0.33041 },
    ];
    for (const { r, zeta, expected } of cases) {
      const fn = 100;
      const h = 1 / (200 * fn); // linear interpolation of the sine loses (ωh)²/12 of its amplitude: 1e-4 here
      const s = new ExactSdof(fn, zeta, h);
      const w = 2 * Math.PI * r * fn;
      let peak = 0;
      const settle = Math.ceil(12 / (zeta * 2 * Math.PI * fn) / h);
      const total = settle + Math.ceil(2 / (r * fn) / h);
      for (let k = 0; k < total; k++) {
        s.step(Math.sin(w * k * h), Math.sin(w * (k + 1) * h));
        if (k > settle) peak = Math.max(peak, Math.abs(s.y));
      }
      expect(Math.abs(peak / expected - 1)).toBeLessThan(2e-3);
    }
  });

  it('rings as area·ω²/ω_d·e^(−ζωt)·sin(ω_d t) after an impulse between samples', () => {
    const fHz = 3000;
    const zeta = 0.04;
    const h = 1 / 48000;
    const s = new ExactSdof(fHz, zeta, h);
    const w = 2 * Math.PI * fHz;
    const wd = w * Math.sqrt(1 - zeta * zeta);
    const tau = 0.37 * h; // the impulse falls 0.37 of a step after t = 0
    s.step(0, 0);
    s.impulse(2, h - tau);
    for (let k = 2; k < 200; k++) {
      s.step(0, 0);
      const t = k * h - tau;
      const expected = ((2 * w * w) / wd) * Math.exp(-zeta * w * t) * Math.sin(wd * t);
      expect(Math.abs(s.y - expected)).toBeLessThan(1e-9 * w);
    }
  });

  it('rejects a damping ratio outside (0, 1) and a non-positive frequency', () => {
    expect(() => new ExactSdof(100, 1, 1e-4)).toThrow(/dampingRatio/);
    expect(() => new ExactSdof(0, 0.1, 1e-4)).toThrow(/frequencyHz/);
  });
});
