import { DiagnosisInputError } from './errors.js';
import { fftPlan } from './fft-plan.js';

export interface SpectralKurtosis {
  frequenciesHz: Float64Array;
  /** K(f); the DC and Nyquist bins are real-valued (their SK is about +1 on noise) and are set to NaN. */
  values: Float64Array;
  segments: number;
}

export interface SpectralKurtosisOptions {
  /** STFT segment length, a power of two >= 16 (default 128). */
  segmentLength?: number;
  /** Fraction of a segment shared by neighbours, 0 <= f < 1 (default 0.75). */
  overlapFraction?: number;
}

/**
 * Spectral kurtosis on short-time Fourier transform bins, K(f) = <|X|⁴>/<|X|²>² − 2: 0 for stationary Gaussian
 * noise, −1 for a pure tone, large where transients (impacts ringing a resonance) dominate.
 * Periodic Hann window, no detrending and no boundary padding, as scipy.signal.stft(boundary=None, padded=False).
 */
// J. Antoni, "The spectral kurtosis: a useful tool for characterising non-stationary signals", MSSP 20:282–307 (2006).
export function spectralKurtosis(samples: ArrayLike<number>, sampleRateHz: number, options: SpectralKurtosisOptions = {}): SpectralKurtosis {
  const segmentLength = options.segmentLength ?? 128;
  const overlapFraction = options.overlapFraction ?? 0.75;
  if (!Number.isInteger(segmentLength) || segmentLength < 16 || (segmentLength & (segmentLength - 1)) !== 0) {
    throw new DiagnosisInputError('invalid_argument', `segmentLength (${segmentLength}) must be a power of two >= 16`);
  }
  if (!(overlapFraction >= 0 && overlapFraction < 1)) {
    throw new DiagnosisInputError('invalid_argument', `overlapFraction (${overlapFraction}) must be >= 0 and < 1`);
  }
  if (!(sampleRateHz > 0)) throw new DiagnosisInputError('invalid_argument', `sampleRateHz (${sampleRateHz}) must be > 0`);
  const step = Math.max(1, segmentLength - Math.round(overlapFraction * segmentLength));
  if (samples.length < segmentLength) {
    throw new DiagnosisInputError('invalid_argument', `samples (${samples.length}) must be at least segmentLength (${segmentLength}) long`);
  }
  const segments = Math.floor((samples.length - segmentLength) / step) + 1;
  const bins = segmentLength / 2 + 1;
  // Periodic Hann: the DFT-even window scipy.signal.get_window('hann') returns.
  const window = new Float64Array(segmentLength);
  for (let i = 0; i < segmentLength; i++) window[i] = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / segmentLength);
  const plan = fftPlan(segmentLength);
  const frame = new Float64Array(segmentLength);
  const spectrum = new Float64Array(2 * segmentLength);
  const p2 = new Float64Array(bins);
  const p4 = new Float64Array(bins);
  for (let s = 0; s < segments; s++) {
    const start = s * step;
    for (let i = 0; i < segmentLength; i++) frame[i] = samples[start + i]! * window[i]!;
    plan.realTransform(spectrum, frame);
    for (let k = 0; k < bins; k++) {
      const re = spectrum[2 * k]!;
      const im = spectrum[2 * k + 1]!;
      const power = re * re + im * im;
      p2[k] += power;
      p4[k] += power * power;
    }
  }
  const frequenciesHz = new Float64Array(bins);
  const values = new Float64Array(bins);
  for (let k = 0; k < bins; k++) {
    frequenciesHz[k] = (k * sampleRateHz) / segmentLength;
    const m2 = p2[k]! / segments;
    const m4 = p4[k]! / segments;
    values[k] = m2 > 0 ? m4 / (m2 * m2) - 2 : Number.NaN;
  }
  values[0] = Number.NaN;
  values[bins - 1] = Number.NaN;
  return { frequenciesHz, values, segments };
}
