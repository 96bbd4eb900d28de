/**
 * Primitives that add one physical component to a simulated signal. Everything is computed as
 * acceleration (m/s²) and converted on the fly to the sensor's quantity: `integrations` is 0 for
 * acceleration, 1 for velocity, 2 for displacement.
 */
export interface Synth {
  sampleRateHz: number;
  sampleCount: number;
  /** Revolutions of the reference shaft at each sample. */
  refRevolutions: Float64Array;
  /** Speed of the reference shaft at each sample, Hz. */
  refSpeedHz: Float64Array;
  integrations: 0 | 1 | 2;
  /** The signal being built, in SI units of the sensor's quantity (m/s², m/s or m). */
  out: Float64Array;
}

/** Lowest frequency used when converting to velocity or displacement, so a shaft at rest does not divide by zero. */
const MIN_CONVERSION_HZ = 0.5;

/**
 * A sinusoid locked to a shaft: order `order` of a shaft turning at `ratio` × the reference speed,
 * peak acceleration `amplitudeMs2`, optionally multiplied sample by sample by `envelope`.
 */
export function addOrderTone(
  synth: Synth,
  ratio: number,
  order: number,
  amplitudeMs2: number,
  phaseRad: number,
  envelope?: Float64Array,
): void {
  if (amplitudeMs2 === 0) return;
  const { out, refRevolutions, refSpeedHz, integrations } = synth;
  const k = 2 * Math.PI * order * ratio;
  const shift = (integrations * Math.PI) / 2;
  for (let i = 0; i < out.length; i++) {
    let a = amplitudeMs2;
    if (integrations > 0) {
      // Integrating a sinusoid of slowly varying frequency divides it by ω and delays it by 90° per integration.
      const w = 2 * Math.PI * Math.max(order * ratio * refSpeedHz[i]!, MIN_CONVERSION_HZ);
      a /= integrations === 1 ? w : w * w;
    }
    const e = envelope ? envelope[i]! : 1;
    out[i] += a * e * Math.cos(k * refRevolutions[i]! + phaseRad - shift);
  }
}

/** A sinusoid at a fixed frequency (electrical lines do not follow the shaft). */
export function addFixedTone(synth: Synth, frequencyHz: number, amplitudeMs2: number, phaseRad: number): void {
  if (amplitudeMs2 === 0) return;
  const { out, sampleRateHz, integrations } = synth;
  const w = 2 * Math.PI * frequencyHz;
  const a = integrations === 0 ? amplitudeMs2 : amplitudeMs2 / w ** integrations;
  const shift = (integrations * Math.PI) / 2;
  for (let i = 0; i < out.length; i++) out[i] += a * Math.cos((w * i) / sampleRateHz + phaseRad - shift);
}

export interface StructuralResonance {
  frequencyHz: number;
  dampingRatio: number;
  /** Share of each impact that rings this mode. */
  weight: number;
}

/**
 * One impact ringing the structure at time `timeS`: a sum of decaying sinusoids, one per resonance,
 * with peak acceleration about `amplitudeMs2`.
 */
// Impulse response of a lightly damped single-degree-of-freedom mode: e^(-ζωn t)·sin(ωd t), ωd = ωn·√(1-ζ²) (e.g. Rao, Mechanical Vibrations, ch. 2).
export function addRing(synth: Synth, timeS: number, amplitudeMs2: number, resonances: readonly StructuralResonance[]): void {
  if (amplitudeMs2 === 0) return;
  const { out, sampleRateHz, integrations } = synth;
  for (const r of resonances) {
    const wn = 2 * Math.PI * r.frequencyHz;
    const sigma = r.dampingRatio * wn;
    const wd = wn * Math.sqrt(1 - r.dampingRatio * r.dampingRatio);
    const a = (amplitudeMs2 * r.weight) / wn ** integrations;
    const shift = (integrations * Math.PI) / 2;
    // Stop when the envelope has decayed to 1e-4 of its start (ln 1e4 ≈ 9.21).
    const lengthS = 9.21 / sigma;
    const first = Math.max(0, Math.ceil(timeS * sampleRateHz));
    const last = Math.min(out.length - 1, Math.floor((timeS + lengthS) * sampleRateHz));
    for (let i = first; i <= last; i++) {
      const t = i / sampleRateHz - timeS;
      out[i] += a * Math.exp(-sigma * t) * Math.sin(wd * t - shift);
    }
  }
}

/**
 * Times (s) at which the reference shaft reaches each of `targetRevolutions` (ascending), found by
 * inverting the sampled angle with linear interpolation between samples; targets beyond the record are dropped.
 */
export function timesAtRevolutions(synth: Synth, targetRevolutions: readonly number[]): number[] {
  const revs = synth.refRevolutions;
  const times: number[] = [];
  let i = 0;
  const last = revs.length - 1;
  for (const target of targetRevolutions) {
    if (target < revs[0]! || target > revs[last]!) continue;
    while (i < last && revs[i + 1]! < target) i++;
    const span = i < last ? revs[i + 1]! - revs[i]! : 0;
    const fraction = span > 0 ? (target - revs[i]!) / span : 0;
    times.push((i + fraction) / synth.sampleRateHz);
  }
  return times;
}
