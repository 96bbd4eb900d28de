import type { Complex } from './complex.js';
import { SignatureInputError } from './errors.js';

/*
 * The single-degree-of-freedom oscillator J·θ'' + c·θ' + k·θ = T0·cos(ωt), and its base-excited twin.
 * r = ω/ω_n is the frequency ratio, ζ = c/(2√(kJ)) the damping ratio.
 */

function check(name: string, value: number, min: number, strictMin = false): void {
  if (!Number.isFinite(value) || value < min || (strictMin && value === min)) {
    throw new SignatureInputError('invalid_parameter', `${name} (${value}) must be a finite number ${strictMin ? '>' : '>='} ${min}`);
  }
}

/** ω_n = √(k/J) in rad/s, for a torsional (k in N·m/rad, J in kg·m²) or linear (N/m, kg) oscillator. */
// Thomson & Dahleh, Theory of Vibration with Applications, 5th ed., §2.1 (from memory): ω_n = √(k/m).
export function angularNaturalFrequencyRadPerS(stiffness: number, inertia: number): number {
  check('stiffness', stiffness, 0, true);
  check('inertia', inertia, 0, true);
  return Math.sqrt(stiffness / inertia);
}

/** f_n = √(k/J)/(2π) in Hz. */
export function naturalFrequencyHz(stiffness: number, inertia: number): number {
  return angularNaturalFrequencyRadPerS(stiffness, inertia) / (2 * Math.PI);
}

/** ω_d = ω_n·√(1 − ζ²): the frequency of free, damped oscillation. */
// Thomson & Dahleh, §2.6 (from memory).
export function dampedNaturalFrequencyHz(naturalFrequencyHz: number, dampingRatio: number): number {
  check('naturalFrequencyHz', naturalFrequencyHz, 0);
  check('dampingRatio', dampingRatio, 0);
  if (dampingRatio >= 1) throw new SignatureInputError('invalid_parameter', `dampingRatio (${dampingRatio}) must be < 1 for a damped oscillation`);
  return naturalFrequencyHz * Math.sqrt(1 - dampingRatio * dampingRatio);
}

/** Steady-state amplitude over the static deflection T0/k. */
// Thomson & Dahleh, §3.1 (from memory): M = 1/√((1 − r²)² + (2ζr)²).
export function magnificationFactor(frequencyRatio: number, dampingRatio: number): number {
  check('frequencyRatio', frequencyRatio, 0);
  check('dampingRatio', dampingRatio, 0);
  const r2 = frequencyRatio * frequencyRatio;
  return 1 / Math.sqrt((1 - r2) ** 2 + (2 * dampingRatio * frequencyRatio) ** 2);
}

/** How far the response lags the force, 0..π. */
// Thomson & Dahleh, §3.1 (from memory): φ = atan2(2ζr, 1 − r²).
export function phaseLagRad(frequencyRatio: number, dampingRatio: number): number {
  check('frequencyRatio', frequencyRatio, 0);
  check('dampingRatio', dampingRatio, 0);
  return Math.atan2(2 * dampingRatio * frequencyRatio, 1 - frequencyRatio * frequencyRatio);
}

/** The complex response over the static deflection, 1/(1 − r² + j2ζr): |·| = M, arg = −φ. */
export function normalisedReceptance(frequencyRatio: number, dampingRatio: number): Complex {
  check('frequencyRatio', frequencyRatio, 0);
  check('dampingRatio', dampingRatio, 0);
  const re = 1 - frequencyRatio * frequencyRatio;
  const im = 2 * dampingRatio * frequencyRatio;
  const d = re * re + im * im;
  return { re: re / d, im: -im / d };
}

/**
 * Motion of a mass on a spring and damper over the motion of its base (absolute transmissibility).
 * Equal to 1 at r = √2 for every ζ; the same expression is the force transmitted to a rigid base.
 */
// Thomson & Dahleh, §3.5 (from memory): T = √(1 + (2ζr)²)/√((1 − r²)² + (2ζr)²), complex (1 + j2ζr)/(1 − r² + j2ζr).
export function transmissibility(frequencyRatio: number, dampingRatio: number): Complex {
  const h = normalisedReceptance(frequencyRatio, dampingRatio);
  const nIm = 2 * dampingRatio * frequencyRatio;
  return { re: h.re - nIm * h.im, im: h.im + nIm * h.re };
}
