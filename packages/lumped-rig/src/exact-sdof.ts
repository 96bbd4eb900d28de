/**
 * An underdamped single-degree-of-freedom oscillator stepped exactly for an input that is linear between samples
 * (first-order hold):  ÿ + 2ζω ẏ + ω² y = ω² u(t).
 *
 * With this normalisation y follows u at low frequency (static gain 1), peaks at Q = 1/(2ζ) at ω and falls at
 * 40 dB/decade above. The step is the free response (closed form, e.g. Rao, Mechanical Vibrations, §2.6, damped free
 * vibration) about the particular solution of a ramp input, y_p = u_k + r·t − 2ζr/ω with ẏ_p = r, so it is exact for
 * any step: no stability limit, which lets a resonance sit at 0.45 of the sample rate.
 */
export class ExactSdof {
  readonly omegaRadPerS: number;
  readonly dampingRatio: number;
  readonly stepS: number;
  private readonly sigma: number;
  private readonly omegaD: number;
  private readonly p11: number;
  private readonly p12: number;
  private readonly p21: number;
  private readonly p22: number;
  /** Displacement-like state y and its rate ẏ. */
  y = 0;
  v = 0;

  constructor(frequencyHz: number, dampingRatio: number, stepS: number) {
    if (!(frequencyHz > 0)) throw new RangeError(`frequencyHz (${frequencyHz}) must be > 0`);
    if (!(dampingRatio > 0 && dampingRatio < 1)) throw new RangeError(`dampingRatio (${dampingRatio}) must be > 0 and < 1`);
    if (!(stepS > 0)) throw new RangeError(`stepS (${stepS}) must be > 0`);
    this.omegaRadPerS = 2 * Math.PI * frequencyHz;
    this.dampingRatio = dampingRatio;
    this.stepS = stepS;
    this.sigma = dampingRatio * this.omegaRadPerS;
    this.omegaD = this.omegaRadPerS * Math.sqrt(1 - dampingRatio * dampingRatio);
    const e = Math.exp(-this.sigma * stepS);
    const c = Math.cos(this.omegaD * stepS);
    const s = Math.sin(this.omegaD * stepS);
    this.p11 = e * (c + (this.sigma / this.omegaD) * s);
    this.p12 = (e * s) / this.omegaD;
    this.p21 = (-e * this.omegaRadPerS * this.omegaRadPerS * s) / this.omegaD;
    this.p22 = e * (c - (this.sigma / this.omegaD) * s);
  }

  /** Sets the state to rest at a constant input u (y = u, ẏ = 0). */
  rest(u: number): void {
    this.y = u;
    this.v = 0;
  }

  /** Advances one step with the input going linearly from uStart to uEnd. */
  step(uStart: number, uEnd: number): void {
    const w = this.omegaRadPerS;
    const rate = (uEnd - uStart) / this.stepS;
    const offset = (2 * this.dampingRatio * rate) / w;
    const dy = this.y - (uStart - offset);
    const dv = this.v - rate;
    this.y = uEnd - offset + this.p11 * dy + this.p12 * dv;
    this.v = rate + this.p21 * dy + this.p22 * dv;
  }

  /**
   * Adds an impulse of the input, u = area·δ(t − τ), that fell `delayS` before the current time (0 <= delayS):
   * ẏ jumps by ω²·area at τ and rings freely since.
   */
  impulse(area: number, delayS: number): void {
    const w = this.omegaRadPerS;
    const kick = w * w * area;
    const e = Math.exp(-this.sigma * delayS);
    const c = Math.cos(this.omegaD * delayS);
    const s = Math.sin(this.omegaD * delayS);
    this.y += (kick * e * s) / this.omegaD;
    this.v += kick * e * (c - (this.sigma / this.omegaD) * s);
  }
}
