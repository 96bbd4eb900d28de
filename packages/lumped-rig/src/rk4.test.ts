// Sources: RK4's order (Hairer, Nørsett & Wanner, Solving ODEs I, §II.1) and the SDOF closed forms (Thomson & Dahleh), below.
import { describe, expect, it } from 'vitest';
import { MAX_OMEGA_STEP, Rk4, rk4StepS } from './rk4.js';

/** Undamped or damped SDOF x'' + 2ζω x' + ω² x = f(t) as a first-order system. */
function sdof(w: number, zeta: number, force: (t: number) => number) {
  return (t: number, s: Float64Array, d: Float64Array) => {
    d[0] = s[1]!;
    d[1] = force(t) - 2 * zeta * w * s[1]! - w * w * s[0]!;
  };
}

function freeError(h: number, w: number, cycles: number): number {
  const rk = new Rk4(2, sdof(w, 0, () => 0));
  const s = Float64Array.of(1, 0);
  const steps = Math.round((cycles * 2 * Math.PI) / w / h);
  let worst = 0;
  for (let k = 0; k < steps; k++) {
    rk.step(k * h, h, s);
    worst = Math.max(worst, Math.abs(s[0]! - Math.cos(w * (k + 1) * h)));
  }
  return worst;
}

describe('Rk4', () => {
  it('is fourth order: halving the step divides the error of an undamped SDOF by about 16 (Hairer, Nørsett & Wanner, §II.1)', () => {
    const w = 2 * Math.PI * 50;
    const e1 = freeError(0.1 / w, w, 5);
    const e2 = freeError(0.05 / w, w, 5);
    expect(e1 / e2).toBeGreaterThan(14);
    expect(e1 / e2).toBeLessThan(18);
  });

  it('loses about (ωh)^6/144 of amplitude per step at the rig step ω·h = 0.6 (the series of |R(iωh)|), far below physical damping', () => {
    const w = 2 * Math.PI * 1000;
    const h = MAX_OMEGA_STEP / w;
    const rk = new Rk4(2, sdof(w, 0, () => 0));
    const s = Float64Array.of(1, 0);
    const steps = 2000;
    for (let k = 0; k < steps; k++) rk.step(k * h, h, s);
    const energy = s[0]! ** 2 + (s[1]! / w) ** 2;
    const lossPerStep = 1 - Math.sqrt(energy) ** (1 / steps);
    const series = MAX_OMEGA_STEP ** 6 / 144 - MAX_OMEGA_STEP ** 8 / 1152;
    expect(Math.abs(lossPerStep / series - 1)).toBeLessThan(0.05);
    // Equivalent numerical damping ratio (ωh)^5/144 ≈ 5.4e-4, vs 1-10 % physical damping in the rig.
    expect(lossPerStep / MAX_OMEGA_STEP).toBeLessThan(6e-4);
  });

  it('gives the closed-form forced response of a damped SDOF, transient plus steady state (Thomson & Dahleh §3.1), within 1.5 % at ω·h = 0.6 and 0.1 % at 0.3', () => {
    const w = 2 * Math.PI * 80;
    const zeta = 0.05;
    const W = 0.7 * w;
    const F = 3;
    // Steady state X cos(Wt − φ): X = (F/ω²)·M, M = 1/√((1−r²)² + (2ζr)²), φ = atan2(2ζr, 1−r²).
    const r = W / w;
    const X = F / (w * w) / Math.sqrt((1 - r * r) ** 2 + (2 * zeta * r) ** 2);
    const phi = Math.atan2(2 * zeta * r, 1 - r * r);
    // Transient from rest: x_t = e^(−ζωt)(A cos ω_d t + B sin ω_d t) with x(0) = 0, x'(0) = 0.
    const wd = w * Math.sqrt(1 - zeta * zeta);
    const A = -X * Math.cos(phi);
    const B = (-X * W * Math.sin(phi) + zeta * w * A) / wd;
    const worstError = (omegaStep: number) => {
      const rk = new Rk4(2, sdof(w, zeta, (t) => F * Math.cos(W * t)));
      const h = omegaStep / w;
      const s = Float64Array.of(0, 0);
      let worst = 0;
      for (let k = 0; k < Math.round(2400 / omegaStep); k++) {
        rk.step(k * h, h, s);
        const t = (k + 1) * h;
        const exact = X * Math.cos(W * t - phi) + Math.exp(-zeta * w * t) * (A * Math.cos(wd * t) + B * Math.sin(wd * t));
        worst = Math.max(worst, Math.abs(s[0]! - exact));
      }
      return worst / X;
    };
    expect(worstError(MAX_OMEGA_STEP)).toBeLessThan(0.015);
    expect(worstError(MAX_OMEGA_STEP / 2)).toBeLessThan(1e-3);
  });

  it('names the bad argument', () => {
    expect(() => rk4StepS(0)).toThrow(/highestNaturalFrequencyHz/);
    expect(() => new Rk4(0, () => undefined)).toThrow(/size/);
  });
});
