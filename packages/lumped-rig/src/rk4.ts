/**
 * Classical fourth-order Runge-Kutta with a fixed step, for the rig's first-order state equations
 * (Kutta 1901; e.g. Hairer, Nørsett & Wanner, Solving ODEs I, §II.1).
 *
 * Why this scheme: the rig's forces are time-varying (mesh stiffness) and piecewise (tooth contact loss, a loose
 * foot lifting off), which an explicit scheme takes as they are, with no Newton iterations. Run with
 * ω_max·h <= 0.6 (see `rk4StepS`), RK4 loses (ωh)^6/144 of amplitude per step, i.e. a numerical damping ratio of
 * about (ωh)^5/144 <= 5.4e-4 (two orders below the 1-10 % physical damping of the rig), and its period error is
 * about (ωh)^4/120 <= 0.11 % (both from the series of the RK4 amplification factor, derived in the README).
 */

/** dy/dt = f(t, y), written into `out` (no allocation per call). */
export type Derivative = (tS: number, state: Float64Array, out: Float64Array) => void;

/** Largest ω·h the rig integrates with (rad): see the module comment. */
export const MAX_OMEGA_STEP = 0.6;

/** The step (s) that keeps ω_max·h at MAX_OMEGA_STEP for a highest natural frequency in Hz. */
export function rk4StepS(highestNaturalFrequencyHz: number): number {
  if (!(highestNaturalFrequencyHz > 0)) throw new RangeError(`highestNaturalFrequencyHz (${highestNaturalFrequencyHz}) must be > 0`);
  return MAX_OMEGA_STEP / (2 * Math.PI * highestNaturalFrequencyHz);
}

/** A reusable RK4 stepper for states of a fixed size. */
export class Rk4 {
  private readonly k1: Float64Array;
  private readonly k2: Float64Array;
  private readonly k3: Float64Array;
  private readonly k4: Float64Array;
  private readonly tmp: Float64Array;

  constructor(readonly size: number, private readonly f: Derivative) {
    if (!(Number.isInteger(size) && size > 0)) throw new RangeError(`size (${size}) must be a whole number > 0`);
    this.k1 = new Float64Array(size);
    this.k2 = new Float64Array(size);
    this.k3 = new Float64Array(size);
    this.k4 = new Float64Array(size);
    this.tmp = new Float64Array(size);
  }

  /** Advances `state` in place from tS to tS + stepS. */
  step(tS: number, stepS: number, state: Float64Array): void {
    const { k1, k2, k3, k4, tmp, size, f } = this;
    const half = stepS / 2;
    f(tS, state, k1);
    for (let i = 0; i < size; i++) tmp[i] = state[i]! + half * k1[i]!;
    f(tS + half, tmp, k2);
    for (let i = 0; i < size; i++) tmp[i] = state[i]! + half * k2[i]!;
    f(tS + half, tmp, k3);
    for (let i = 0; i < size; i++) tmp[i] = state[i]! + stepS * k3[i]!;
    f(tS + stepS, tmp, k4);
    const sixth = stepS / 6;
    for (let i = 0; i < size; i++) state[i] = state[i]! + sixth * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
  }
}
