import { spectraError } from './spectra-error.js';
import { assertDetrendMode, trendOf, type DetrendMode } from './detrend.js';
import { complexFft, isPowerOfTwo, largestPowerOfTwoAtMost } from './fft.js';
import { scratchArray } from './scratch.js';
import {
  assertAveraging,
  assertScaling,
  valueUnitOf,
  type AveragingMode,
  type Spectrum,
  type SpectrumScaling,
} from './spectrum.js';
import { assertWindowName, sharedWindow, type WindowName } from './window.js';

export interface WelchOptions {
  /** Default 'hann'. */
  window?: WindowName;
  /** Samples per segment; default min(8192, largest power of two <= record length). Any integer >= 2. */
  segmentLength?: number;
  /** Overlap between segments, 0 <= overlapFraction < 1; default 0.5. Rounded to whole samples. */
  overlapFraction?: number;
  /** Default 'mean' (scipy's 'constant'). */
  detrend?: DetrendMode;
  /** Default 'psd'. */
  scaling?: SpectrumScaling;
  /** Default 'linear'. */
  averaging?: AveragingMode;
  /** Unit of the samples, carried into the result; default ''. */
  unit?: string;
}

export const DEFAULT_SEGMENT_LENGTH = 8192;

/**
 * One-sided spectrum by Welch's method: the record is cut into overlapping segments, each is
 * detrended, windowed and transformed, and the periodograms are averaged.
 *
 * P. D. Welch, "The use of fast Fourier transform for the estimation of power spectra: a method based
 * on time averaging over short, modified periodograms", IEEE Trans. Audio Electroacoust. 15(2):70-73, 1967.
 *
 * Segments, scalings and one-sided doubling follow scipy.signal.welch exactly: segment s starts at
 * s*(N - noverlap), there are floor((len - noverlap) / (N - noverlap)) of them (a tail shorter than a
 * segment is dropped, not padded), density = |X|^2 / (fs sum w^2), spectrum = |X|^2 / (sum w)^2, and
 * every bin except DC and the unpaired Nyquist bin is doubled to fold in the negative frequencies.
 */
export function welchSpectrum(samples: Float64Array, sampleRateHz: number, options: WelchOptions = {}): Spectrum {
  assertSampleRate(sampleRateHz);
  assertFiniteSamples(samples);
  const window = assertWindowName(options.window ?? 'hann');
  const detrend = assertDetrendMode(options.detrend ?? 'mean');
  const scaling = assertScaling(options.scaling ?? 'psd');
  const averaging = assertAveraging(options.averaging ?? 'linear');
  const total = samples.length;
  if (total < 2) {
    throw spectraError('record_too_short', `the record has ${total} sample(s); a spectrum needs at least 2`);
  }
  const n = options.segmentLength ?? Math.min(DEFAULT_SEGMENT_LENGTH, largestPowerOfTwoAtMost(total));
  if (!Number.isInteger(n) || n < 2) {
    throw spectraError('invalid_segment_length', `segmentLength (${n}) must be an integer >= 2`);
  }
  if (n > total) {
    throw spectraError(
      'segment_too_long',
      `segmentLength (${n}) is longer than the record (${total} samples); use at most ${largestPowerOfTwoAtMost(total)}`,
    );
  }
  const overlapFraction = options.overlapFraction ?? 0.5;
  if (!(overlapFraction >= 0 && overlapFraction < 1)) {
    throw spectraError('invalid_overlap', `overlapFraction (${overlapFraction}) must be >= 0 and < 1`);
  }
  const noverlap = Math.min(n - 1, Math.round(overlapFraction * n));
  const step = n - noverlap;
  const segments = Math.floor((total - noverlap) / step);
  const w = sharedWindow(window, n);
  const bins = Math.floor(n / 2) + 1;
  const acc = scratchArray('welch-accumulator', bins).fill(0);
  if (isPowerOfTwo(n) && n >= 4) accumulatePairs(samples, w, n, step, segments, detrend, averaging, acc);
  else accumulateSingles(samples, w, n, step, segments, detrend, averaging, acc);

  let sumW = 0;
  let sumW2 = 0;
  for (let i = 0; i < n; i++) {
    sumW += w[i];
    sumW2 += w[i] * w[i];
  }
  const average = averaging === 'linear' ? 1 / segments : 1;
  // scipy _spectral_py: density scale 1/(fs sum w^2), spectrum scale 1/(sum w)^2
  const base = scaling === 'psd' ? 1 / (sampleRateHz * sumW2) : 1 / (sumW * sumW);
  const lastPaired = n % 2 === 0 ? bins - 2 : bins - 1;
  const values = new Float64Array(bins);
  for (let k = 0; k < bins; k++) {
    // one-sided: fold the negative frequencies into their positive twins; DC and Nyquist have none
    const paired = k >= 1 && k <= lastPaired;
    const power = acc[k] * average * base * (paired ? 2 : 1);
    if (scaling === 'rms') values[k] = Math.sqrt(power);
    else if (scaling === 'peak') values[k] = Math.sqrt(paired ? 2 * power : power);
    else values[k] = power;
  }
  const frequenciesHz = new Float64Array(bins);
  for (let k = 0; k < bins; k++) frequenciesHz[k] = (k * sampleRateHz) / n;
  const unit = options.unit ?? '';
  return {
    frequenciesHz,
    values,
    scaling,
    unit,
    valueUnit: valueUnitOf(unit, scaling),
    window,
    detrend,
    averaging,
    segmentLength: n,
    overlapFraction: noverlap / n,
    overlapSamples: noverlap,
    averages: segments,
    frequencyResolutionHz: sampleRateHz / n,
    enbwBins: (n * sumW2) / (sumW * sumW),
    sampleRateHz,
  };
}

/** Welch power spectral density (unit^2/Hz); shorthand for welchSpectrum with scaling 'psd'. */
export function welchPsd(samples: Float64Array, sampleRateHz: number, options: Omit<WelchOptions, 'scaling'> = {}): Spectrum {
  return welchSpectrum(samples, sampleRateHz, { ...options, scaling: 'psd' });
}

/**
 * The spectrum of the whole record as one windowed segment (no averaging), any record length.
 * Defaults: Hann window, mean removed, scaling 'peak'.
 */
export function magnitudeSpectrum(
  samples: Float64Array,
  sampleRateHz: number,
  options: Omit<WelchOptions, 'segmentLength' | 'overlapFraction' | 'averaging'> = {},
): Spectrum {
  return welchSpectrum(samples, sampleRateHz, {
    scaling: 'peak',
    ...options,
    segmentLength: samples.length,
    overlapFraction: 0,
    averaging: 'linear',
  });
}

export function assertSampleRate(sampleRateHz: number, parameter = 'sampleRateHz'): void {
  if (!(Number.isFinite(sampleRateHz) && sampleRateHz > 0)) {
    throw spectraError('sample_rate_invalid', `${parameter} (${sampleRateHz}) must be a finite number > 0`);
  }
}

export function assertFiniteSamples(samples: Float64Array, parameter = 'samples'): void {
  if (!(samples instanceof Float64Array)) {
    throw spectraError('invalid_samples', `${parameter} must be a Float64Array`);
  }
  for (let i = 0; i < samples.length; i++) {
    // x - x is NaN for NaN and +-Infinity, 0 otherwise: one test per sample
    if (samples[i] - samples[i] !== 0) {
      throw spectraError('non_finite_sample', `${parameter}[${i}] is ${samples[i]}; every sample must be a finite number`, `${parameter}[${i}]`);
    }
  }
}

function fillSegment(
  x: Float64Array,
  start: number,
  w: Float64Array,
  n: number,
  detrend: DetrendMode,
  out: Float64Array,
  offset: number,
): void {
  const [c0, slope] = trendOf(x, start, n, detrend);
  if (slope === 0) {
    for (let i = 0; i < n; i++) out[2 * i + offset] = (x[start + i] - c0) * w[i];
  } else {
    for (let i = 0; i < n; i++) out[2 * i + offset] = (x[start + i] - (c0 + slope * i)) * w[i];
  }
}

/**
 * Two real segments per complex FFT: with z = a + j b, A_k = (Z_k + conj Z_{N-k}) / 2 and
 * B_k = (Z_k - conj Z_{N-k}) / 2j (E. O. Brigham, The Fast Fourier Transform, Prentice-Hall 1974, ch. 10; chapter from memory),
 * which halves the transforms against one real FFT per segment.
 */
function accumulatePairs(
  x: Float64Array,
  w: Float64Array,
  n: number,
  step: number,
  segments: number,
  detrend: DetrendMode,
  averaging: AveragingMode,
  acc: Float64Array,
): void {
  const plan = complexFft(n);
  // Every element of data is written below (both halves of a pair, or the real half and zeros), and the
  // transform writes all of out.
  const data = scratchArray('welch-segments', 2 * n);
  const out = scratchArray('welch-transform', 2 * n);
  const half = n >> 1;
  const hold = averaging === 'peak-hold';
  for (let s = 0; s < segments; s += 2) {
    fillSegment(x, s * step, w, n, detrend, data, 0);
    const pair = s + 1 < segments;
    if (pair) fillSegment(x, (s + 1) * step, w, n, detrend, data, 1);
    else for (let i = 0; i < n; i++) data[2 * i + 1] = 0;
    plan.forward(out, data);
    for (let k = 0; k <= half; k++) {
      const m = k === 0 ? 0 : n - k;
      const zr = out[2 * k];
      const zi = out[2 * k + 1];
      const vr = out[2 * m];
      const vi = out[2 * m + 1];
      const ar = zr + vr;
      const ai = zi - vi;
      const pa = 0.25 * (ar * ar + ai * ai);
      if (hold) {
        if (pa > acc[k]) acc[k] = pa;
      } else acc[k] += pa;
      if (pair) {
        const br = zi + vi;
        const bi = zr - vr;
        const pb = 0.25 * (br * br + bi * bi);
        if (hold) {
          if (pb > acc[k]) acc[k] = pb;
        } else acc[k] += pb;
      }
    }
  }
}

function accumulateSingles(
  x: Float64Array,
  w: Float64Array,
  n: number,
  step: number,
  segments: number,
  detrend: DetrendMode,
  averaging: AveragingMode,
  acc: Float64Array,
): void {
  const plan = complexFft(n);
  // fillSegment writes the real parts; the imaginary parts stay zero.
  const data = scratchArray('welch-segments', 2 * n).fill(0);
  const out = scratchArray('welch-transform', 2 * n);
  const bins = acc.length;
  const hold = averaging === 'peak-hold';
  for (let s = 0; s < segments; s++) {
    fillSegment(x, s * step, w, n, detrend, data, 0);
    plan.forward(out, data);
    for (let k = 0; k < bins; k++) {
      const p = out[2 * k] * out[2 * k] + out[2 * k + 1] * out[2 * k + 1];
      if (hold) {
        if (p > acc[k]) acc[k] = p;
      } else acc[k] += p;
    }
  }
}
