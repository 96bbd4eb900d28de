// Reference spectra for the tests, computed with fft.js (a general-purpose FFT, not the project's own signal code).
import FFT from 'fft.js';

/** One-sided amplitude spectrum of the first 2^k samples with a periodic Hann window, scaled so a sine of amplitude A reads A at its bin. */
export function amplitudeSpectrum(x: ArrayLike<number>, sampleRateHz: number): { amplitude: Float64Array; binHz: number } {
  let n = 1;
  while (n * 2 <= x.length) n *= 2;
  const fft = new FFT(n);
  const input = new Array<number>(n);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let windowSum = 0;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    windowSum += w;
    input[i] = (x[i]! - mean) * w;
  }
  const out = fft.createComplexArray() as number[];
  fft.realTransform(out, input);
  const amplitude = new Float64Array(n / 2);
  for (let k = 0; k < n / 2; k++) amplitude[k] = (2 * Math.hypot(out[2 * k]!, out[2 * k + 1]!)) / windowSum;
  return { amplitude, binHz: sampleRateHz / n };
}

/** Largest amplitude within ±`bins` of a frequency. */
export function amplitudeNear(s: { amplitude: Float64Array; binHz: number }, frequencyHz: number, bins = 2): number {
  const k = Math.round(frequencyHz / s.binHz);
  let m = 0;
  for (let j = Math.max(0, k - bins); j <= Math.min(s.amplitude.length - 1, k + bins); j++) m = Math.max(m, s.amplitude[j]!);
  return m;
}

/**
 * Averaged one-sided PSD (units²/Hz): rectangular segments of `segment` samples, no overlap, so that Parseval holds
 * exactly per segment: Σ PSD·Δf = mean square of the segment.
 */
export function averagedPsd(x: ArrayLike<number>, sampleRateHz: number, segment: number): { psd: Float64Array; binHz: number } {
  const fft = new FFT(segment);
  const psd = new Float64Array(segment / 2 + 1);
  const count = Math.floor(x.length / segment);
  const out = fft.createComplexArray() as number[];
  for (let s = 0; s < count; s++) {
    const input = Array.from({ length: segment }, (_, i) => x[s * segment + i]!);
    fft.realTransform(out, input);
    fft.completeSpectrum(out);
    for (let k = 0; k <= segment / 2; k++) {
      const p = (out[2 * k]! ** 2 + out[2 * k + 1]! ** 2) / (sampleRateHz * segment);
      psd[k] = psd[k]! + (k === 0 || k === segment / 2 ? p : 2 * p) / count;
    }
  }
  return { psd, binHz: sampleRateHz / segment };
}

/** Squared envelope spectrum of the band [lowHz, highHz] (analytic signal by zeroing the other bins). */
export function envelopeSpectrum(x: ArrayLike<number>, sampleRateHz: number, lowHz: number, highHz: number): { amplitude: Float64Array; binHz: number } {
  let n = 1;
  while (n * 2 <= x.length) n *= 2;
  const fft = new FFT(n);
  const spec = fft.createComplexArray() as number[];
  fft.realTransform(spec, Array.from({ length: n }, (_, i) => x[i]!));
  fft.completeSpectrum(spec);
  for (let k = 0; k < n; k++) {
    const f = (k * sampleRateHz) / n;
    const keep = k < n / 2 && f >= lowHz && f <= highHz;
    spec[2 * k] = keep ? 2 * spec[2 * k]! : 0;
    spec[2 * k + 1] = keep ? 2 * spec[2 * k + 1]! : 0;
  }
  const analytic = fft.createComplexArray() as number[];
  fft.inverseTransform(analytic, spec);
  const envelope = Array.from({ length: n }, (_, i) => analytic[2 * i]! ** 2 + analytic[2 * i + 1]! ** 2);
  return amplitudeSpectrum(envelope, sampleRateHz);
}

/** Amplitude of the tone at exactly frequencyHz (Hann-windowed single-bin DFT: no scalloping, little leakage). */
export function toneAmplitude(x: ArrayLike<number>, sampleRateHz: number, frequencyHz: number): number {
  const n = x.length;
  let re = 0;
  let im = 0;
  let windowSum = 0;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    const phase = (2 * Math.PI * frequencyHz * i) / sampleRateHz;
    re += w * x[i]! * Math.cos(phase);
    im -= w * x[i]! * Math.sin(phase);
    windowSum += w;
  }
  return (2 * Math.hypot(re, im)) / windowSum;
}
