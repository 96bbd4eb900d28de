import { spectraError } from './spectra-error.js';
import { assertBand, type BandHz } from './band-rms.js';
import { complexFft, inverseComplexSpectrum, realSpectrumInto, realToComplexSpectrum } from './fft.js';
import { scratchArray } from './scratch.js';
import type { Spectrum } from './spectrum.js';
import { assertFiniteSamples, assertSampleRate, welchSpectrum, type WelchOptions } from './welch.js';

export interface AnalyticSignal {
  /** The input itself (up to rounding). */
  re: Float64Array;
  /** Its Hilbert transform. */
  im: Float64Array;
}

/**
 * Multiplies a full two-sided DFT by scipy.signal.hilbert's weights (h = 1 at DC and at an even
 * record's Nyquist line, 2 on positive frequencies, 0 on negative ones) and, when a band is given,
 * zeroes every line outside it (in place).
 */
function applyAnalyticWeights(X: Float64Array, n: number, band?: Band): void {
  const half = Math.floor(n / 2);
  for (let k = 0; k < n; k++) {
    let h: number;
    if (k === 0 || (n % 2 === 0 && k === half)) h = 1;
    else if (k < n - k) h = 2;
    else h = 0;
    if (h !== 0 && band && !inBand(band, n, k)) h = 0;
    X[2 * k] *= h;
    X[2 * k + 1] *= h;
  }
}

/** The inverse DFT of the weighted spectrum, the analytic signal. */
function analyticFromSpectrum(X: Float64Array, n: number, band?: Band): AnalyticSignal {
  applyAnalyticWeights(X, n, band);
  const z = inverseComplexSpectrum(X);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    re[i] = z[2 * i];
    im[i] = z[2 * i + 1];
  }
  return { re, im };
}

/**
 * Analytic signal x + j H{x} by the FFT method, as scipy.signal.hilbert (S. L. Marple, "Computing the
 * discrete-time analytic signal via FFT", IEEE Trans. Signal Process. 47(9):2600-2603, 1999).
 * The DFT treats the record as periodic: expect end effects on records that do not hold whole cycles.
 */
export function analyticSignal(samples: Float64Array): AnalyticSignal {
  assertFiniteSamples(samples);
  if (samples.length === 0) return { re: new Float64Array(0), im: new Float64Array(0) };
  return analyticFromSpectrum(realToComplexSpectrum(samples), samples.length);
}

/** A checked band and the line spacing of the record it applies to. */
interface Band {
  lowHz: number;
  highHz: number;
  df: number;
}

/** Whether DFT line k of an n-point record lies in the band (negative frequencies by their magnitude). */
function inBand(band: Band, n: number, k: number): boolean {
  const f = Math.min(k, n - k) * band.df;
  return f >= band.lowHz && f <= band.highHz;
}

function checkedBand(n: number, sampleRateHz: number, bandHz: BandHz): Band {
  assertSampleRate(sampleRateHz);
  assertBand(bandHz);
  const nyquist = sampleRateHz / 2;
  if (bandHz[0] >= nyquist) {
    throw spectraError('band_above_nyquist', `bandHz [${bandHz[0]}, ${bandHz[1]}] starts at or above the Nyquist frequency ${nyquist} Hz`);
  }
  const df = sampleRateHz / n;
  let inBand = 0;
  for (let k = 0; k <= n / 2; k++) if (k * df >= bandHz[0] && k * df <= bandHz[1]) inBand++;
  if (inBand === 0) {
    throw spectraError('empty_band', `bandHz [${bandHz[0]}, ${bandHz[1]}] holds no spectral line of this record (lines every ${df} Hz)`);
  }
  return { lowHz: bandHz[0], highHz: bandHz[1], df };
}

/**
 * Ideal band-pass on the whole record: DFT, every line outside [low, high] set to zero, inverse DFT.
 * Exact (no ripple, no phase shift) for a record read as periodic.
 */
export function fftBandPass(samples: Float64Array, sampleRateHz: number, bandHz: BandHz): Float64Array {
  assertFiniteSamples(samples);
  const n = samples.length;
  if (n === 0) return new Float64Array(0);
  const band = checkedBand(n, sampleRateHz, bandHz);
  const X = realToComplexSpectrum(samples);
  for (let k = 0; k < n; k++) {
    if (!inBand(band, n, k)) {
      X[2 * k] = 0;
      X[2 * k + 1] = 0;
    }
  }
  const z = inverseComplexSpectrum(X);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = z[2 * i];
  return out;
}

export interface EnvelopeOptions {
  /** Band-pass the record to this band first (needs sampleRateHz). */
  bandHz?: BandHz;
  sampleRateHz?: number;
  /** Return |analytic|^2, the squared envelope; default false. */
  squared?: boolean;
}

/** Records longer than this are enveloped block by block (segmentedEnvelope); shorter ones in one transform. */
export const WHOLE_RECORD_ENVELOPE_MAX = 1 << 18;
/** Block length of the block-wise envelope: 2^16 points, a transform whose plan and work arrays are kept. */
export const ENVELOPE_BLOCK = 1 << 16;

/**
 * Envelope |x + j H{x}| of the (optionally band-passed) record, or its square. Band-pass and
 * Hilbert transform share one forward and one inverse DFT (their work arrays are reused between calls).
 * Records longer than WHOLE_RECORD_ENVELOPE_MAX samples go block by block (segmentedEnvelope), in memory
 * and time proportional to their length.
 */
export function hilbertEnvelope(samples: Float64Array, options: EnvelopeOptions = {}): Float64Array {
  assertFiniteSamples(samples);
  const n = samples.length;
  if (n === 0) return new Float64Array(0);
  let band: Band | undefined;
  if (options.bandHz) {
    if (options.sampleRateHz === undefined) {
      throw spectraError('sample_rate_invalid', 'sampleRateHz is required when bandHz is given');
    }
    band = checkedBand(n, options.sampleRateHz, options.bandHz);
  }
  if (n > WHOLE_RECORD_ENVELOPE_MAX) {
    const blockBand = band && options.sampleRateHz !== undefined ? checkedBand(ENVELOPE_BLOCK, options.sampleRateHz, [band.lowHz, band.highHz]) : undefined;
    return segmentedEnvelope(samples, blockBand, options.squared ?? false);
  }
  const X = realSpectrumInto(samples, scratchArray('envelope-spectrum', 2 * n));
  applyAnalyticWeights(X, n, band);
  const z = scratchArray('envelope-analytic', 2 * n);
  complexFft(n).inverse(z, X);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const re = z[2 * i];
    const im = z[2 * i + 1];
    const p = re * re + im * im;
    out[i] = options.squared ? p : Math.sqrt(p);
  }
  return out;
}

/**
 * The envelope of a long record block by block, as overlap-save filtering does (A. V. Oppenheim & R. W. Schafer,
 * "Discrete-Time Signal Processing", 3rd ed., §8.7.3, from memory): blocks of ENVELOPE_BLOCK samples every half
 * block, each band-passed and Hilbert-transformed by one forward and one inverse transform, of which only the
 * middle half is kept. The ideal band-pass and the Hilbert kernel both decay as 1/t, so a quarter block
 * (16,384 samples) of guard on each side leaves every kept sample within about 2e-3 of the envelope's r.m.s.
 * of the whole-record result (envelope.test.ts measures 1.6e-3 on impacts in noise). The record is extended periodically past its ends, as the whole-record DFT
 * treats it. Cost: two 2^16-point transforms per 2^15 samples, whatever the record's length.
 */
function segmentedEnvelope(samples: Float64Array, band: Band | undefined, squared: boolean): Float64Array {
  const n = samples.length;
  const L = ENVELOPE_BLOCK;
  const guard = L / 4;
  const keep = L / 2;
  const out = new Float64Array(n);
  const block = scratchArray('envelope-block', L);
  const X = scratchArray('envelope-block-spectrum', 2 * L);
  const z = scratchArray('envelope-block-analytic', 2 * L);
  const plan = complexFft(L);
  for (let start = 0; start < n; start += keep) {
    const from = start - guard;
    for (let i = 0; i < L; i++) {
      let j = (from + i) % n;
      if (j < 0) j += n;
      block[i] = samples[j]!;
    }
    realSpectrumInto(block, X);
    applyAnalyticWeights(X, L, band);
    plan.inverse(z, X);
    const count = Math.min(keep, n - start);
    for (let i = 0; i < count; i++) {
      const re = z[2 * (guard + i)]!;
      const im = z[2 * (guard + i) + 1]!;
      const p = re * re + im * im;
      out[start + i] = squared ? p : Math.sqrt(p);
    }
  }
  return out;
}

export interface EnvelopeSpectrumOptions extends WelchOptions {
  /** The band around the structural resonance excited by the impacts; chosen by the caller. */
  bandHz: BandHz;
  /** Use the squared envelope (R. B. Randall & J. Antoni, "Rolling element bearing diagnostics: a tutorial", MSSP 25:485-520, 2011, from memory); default false. */
  squared?: boolean;
}

export interface EnvelopeSpectrum extends Spectrum {
  envelopeBandHz: [number, number];
  squaredEnvelope: boolean;
}

/**
 * Envelope spectrum: band-pass to bandHz, envelope by the Hilbert transform, then its Welch
 * spectrum with the same options as welchSpectrum (defaults: Hann, mean removed, scaling 'peak').
 * With detrend 'none' the DC line shows the envelope's mean.
 */
export function envelopeSpectrum(samples: Float64Array, sampleRateHz: number, options: EnvelopeSpectrumOptions): EnvelopeSpectrum {
  if (!options || !options.bandHz) {
    throw spectraError('invalid_band', 'bandHz is required for an envelope spectrum');
  }
  const env = hilbertEnvelope(samples, { bandHz: options.bandHz, sampleRateHz, squared: options.squared ?? false });
  return spectrumOfEnvelope(env, sampleRateHz, options);
}

/**
 * The second half of envelopeSpectrum, for a caller that needs the envelope itself as well: the Welch spectrum of
 * `envelope`, which must be hilbertEnvelope(samples, { bandHz, sampleRateHz, squared }) with the same options.
 */
export function spectrumOfEnvelope(envelope: Float64Array, sampleRateHz: number, options: EnvelopeSpectrumOptions): EnvelopeSpectrum {
  if (!options || !options.bandHz) {
    throw spectraError('invalid_band', 'bandHz is required for an envelope spectrum');
  }
  const { bandHz, squared = false, ...welch } = options;
  const spectrum = welchSpectrum(envelope, sampleRateHz, { scaling: 'peak', ...welch });
  return { ...spectrum, envelopeBandHz: [bandHz[0], bandHz[1]], squaredEnvelope: squared };
}
