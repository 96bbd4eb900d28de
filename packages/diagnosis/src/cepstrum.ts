import { scratchArray } from '@kinespec/signal';
import { DiagnosisInputError } from './errors.js';
import { fftPlan } from './fft-plan.js';

export interface Cepstrum {
  /** Quefrency of each value, seconds (n / (nfft · Δf)). */
  quefrenciesS: Float64Array;
  values: Float64Array;
}

/**
 * Real (power) cepstrum: the inverse Fourier transform of the logarithm of a power spectrum. A family of lines
 * spaced Δ apart (harmonics, or sidebands around a mesh frequency) puts a peak at quefrency 1/Δ, so the period of
 * the modulating shaft reads directly (common practice; R. B. Randall, Vibration-based Condition Monitoring, Wiley
 * 2011, §3.4, from memory). `powerSpectrum` is one-sided with nfft/2 + 1 bins (a Welch PSD or power spectrum, any
 * scaling: a scale factor only moves the zero-quefrency value). Returns quefrencies 0 .. nfft/2.
 */
// Bogert, Healy & Tukey (1963) "quefrency alanysis"; numpy equivalent: np.fft.irfft(np.log(P)).
export function powerCepstrum(powerSpectrum: ArrayLike<number>, frequencyResolutionHz: number): Cepstrum {
  const bins = powerSpectrum.length;
  const nfft = 2 * (bins - 1);
  if (bins < 3 || (nfft & (nfft - 1)) !== 0) {
    throw new DiagnosisInputError('invalid_argument', `powerSpectrum length (${bins}) must be nfft/2 + 1 with nfft a power of two >= 4`);
  }
  if (!(frequencyResolutionHz > 0)) {
    throw new DiagnosisInputError('invalid_argument', `frequencyResolutionHz (${frequencyResolutionHz}) must be > 0`);
  }
  let max = 0;
  for (let k = 0; k < bins; k++) if (powerSpectrum[k]! > max) max = powerSpectrum[k]!;
  // Empty bins (a zero-padded or band-limited spectrum) would give log 0; floor them 120 dB under the largest line.
  const floor = max > 0 ? max * 1e-12 : 1e-300;
  const full = scratchArray('diagnosis:cepstrum-log-spectrum', 2 * nfft).fill(0);
  for (let k = 0; k < bins; k++) {
    const v = Math.log(Math.max(powerSpectrum[k]!, floor));
    full[2 * k] = v;
    if (k > 0 && k < bins - 1) full[2 * (nfft - k)] = v;
  }
  const out = scratchArray('diagnosis:cepstrum-transform', 2 * nfft);
  fftPlan(nfft).inverseTransform(out, full);
  const values = new Float64Array(bins);
  const quefrenciesS = new Float64Array(bins);
  const sampleRateHz = nfft * frequencyResolutionHz;
  for (let n = 0; n < bins; n++) {
    values[n] = out[2 * n]!;
    quefrenciesS[n] = n / sampleRateHz;
  }
  return { quefrenciesS, values };
}

export interface CepstralPeak {
  /** Quefrency of the largest value within the tolerance of the period asked for. */
  quefrencyS: number;
  value: number;
  /** (value − median) / (1.4826 · MAD) of the cepstrum between 0.5 and 1.5 periods: how far the peak stands out. */
  prominence: number;
}

/**
 * The cepstral peak nearest a period (e.g. one revolution of a gear's shaft), searched within
 * ±toleranceFraction of it, with its prominence against the surrounding quefrencies.
 */
export function cepstralPeak(cepstrum: Cepstrum, periodS: number, toleranceFraction = 0.02): CepstralPeak | null {
  const { quefrenciesS, values } = cepstrum;
  const dq = quefrenciesS[1]! - quefrenciesS[0]!;
  const last = values.length - 1;
  const lo = Math.max(2, Math.floor((periodS * (1 - toleranceFraction)) / dq));
  const hi = Math.min(last, Math.ceil((periodS * (1 + toleranceFraction)) / dq));
  if (!(periodS > 0) || lo > hi) return null;
  let at = lo;
  for (let i = lo; i <= hi; i++) if (values[i]! > values[at]!) at = i;
  const wLo = Math.max(2, Math.floor((0.5 * periodS) / dq));
  const wHi = Math.min(last, Math.ceil((1.5 * periodS) / dq));
  // The background statistics need a few hundred values, not every one of a long window.
  const stride = Math.max(1, Math.floor((wHi - wLo + 1) / 400));
  const picked: number[] = [];
  for (let i = wLo; i <= wHi; i += stride) if (i < lo || i > hi) picked.push(values[i]!);
  if (picked.length < 8) return { quefrencyS: quefrenciesS[at]!, value: values[at]!, prominence: 0 };
  // Typed-array sorts: numeric order without a comparator call per comparison.
  const around = Float64Array.from(picked).sort();
  const median = around[Math.floor(around.length / 2)]!;
  const deviations = around.map((v) => Math.abs(v - median)).sort();
  const sigma = 1.4826 * deviations[Math.floor(deviations.length / 2)]!;
  const prominence = sigma > 0 ? (values[at]! - median) / sigma : 0;
  return { quefrencyS: quefrenciesS[at]!, value: values[at]!, prominence };
}
