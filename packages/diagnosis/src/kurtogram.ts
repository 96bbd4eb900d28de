import { scratchArray } from '@kinespec/signal';
import { DiagnosisInputError } from './errors.js';
import { fftPlan, nextPowerOfTwo, previousPowerOfTwo } from './fft-plan.js';

export interface KurtogramBand {
  /** Level in Antoni's 1/3-binary tree: 0, 1, 1.6, 2, 2.6, 3, ... */
  level: number;
  /** Position of the band within its level, 0 = lowest. */
  index: number;
  lowHz: number;
  highHz: number;
  centerHz: number;
  bandwidthHz: number;
  /** Kurtosis of the band's complex envelope, <|c|⁴>/<|c|²>² − 2 (0 for Gaussian noise, −1 for a tone). */
  kurtosis: number;
}

export interface Kurtogram {
  /** The levels computed, in order. */
  levels: number[];
  /** bands[i] are the bands of levels[i], lowest first. */
  bands: KurtogramBand[][];
  /** The band of highest kurtosis among those allowed by the options. */
  best: KurtogramBand;
  /** How many samples were analysed (a power of two taken from the start of the record). */
  samplesUsed: number;
}

export interface KurtogramOptions {
  /** Deepest binary level (bands of width fs / 2^(level+1)); default the deepest with >= 64 envelope samples, at most 7. */
  maxLevel?: number;
  /** Bands narrower than this are computed but never chosen as `best` (an envelope band must hold the fault's sidebands). */
  minBandwidthHz?: number;
  /** Only bands inside [lowHz, highHz] may be chosen (e.g. keep out the shaft-harmonic region); default the whole range. */
  searchRangeHz?: [number, number];
  /** At most this many samples (a power of two) are analysed, from the start; default 32768. */
  maxSamples?: number;
}

/**
 * The fast kurtogram: the spectral kurtosis over Antoni's 1/3-binary paving of the (frequency, bandwidth) plane,
 * levels 0, 1, 1.6, 2, 2.6, ... with 2^k bands of width fs/2^(k+1) at level k and 3·2^(k−1) bands of width
 * fs/(3·2^k) at level k + 0.6. The band of largest kurtosis is where transients (bearing impacts ringing a
 * structural resonance) stand out most above the stationary background; it is the demodulation band of choice.
 * Each band is filtered here by selecting its bins in one FFT of the record (an ideal band-pass) instead of the
 * paper's quasi-analytic FIR tree: the paving and the kurtosis estimator are the paper's, the filter is sharper.
 */
// J. Antoni, "Fast computation of the kurtogram for the detection of transient faults", MSSP 21:108–124 (2007).
export function fastKurtogram(samples: ArrayLike<number>, sampleRateHz: number, options: KurtogramOptions = {}): Kurtogram {
  if (!(sampleRateHz > 0)) throw new DiagnosisInputError('invalid_argument', `sampleRateHz (${sampleRateHz}) must be > 0`);
  if (samples.length < 256) throw new DiagnosisInputError('invalid_argument', `samples (${samples.length}) must hold at least 256 values for a kurtogram`);
  const n = Math.min(previousPowerOfTwo(samples.length), previousPowerOfTwo(options.maxSamples ?? 32768));
  // Envelope sequences shorter than 64 samples give kurtosis estimates too noisy to rank bands.
  const deepest = Math.max(0, Math.floor(Math.log2(n)) - 7);
  const maxLevel = Math.min(options.maxLevel ?? Math.min(7, deepest), deepest);
  if (!Number.isInteger(maxLevel) || maxLevel < 0) {
    throw new DiagnosisInputError('invalid_argument', `maxLevel (${options.maxLevel}) must be a whole number >= 0`);
  }
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i]!;
  mean /= n;
  // A record's two ends do not join: with an ideal band-pass the jump leaks into every band as an edge
  // transient, which a kurtosis reads as an impact. A short cosine taper (Tukey, 5 % at each end) removes the jump,
  // and the envelope moments below skip the tapered ends so that the taper does not bias them either.
  const taper = Math.max(1, Math.floor(n * EDGE_FRACTION));
  const frame = scratchArray('diagnosis:kurtogram-frame', n);
  for (let i = 0; i < n; i++) {
    const w = i < taper ? 0.5 - 0.5 * Math.cos((Math.PI * i) / taper) : i >= n - taper ? 0.5 - 0.5 * Math.cos((Math.PI * (n - 1 - i)) / taper) : 1;
    frame[i] = (samples[i]! - mean) * w;
  }
  const spectrum = scratchArray('diagnosis:kurtogram-spectrum', 2 * n);
  fftPlan(n).realTransform(spectrum, frame);
  const half = n / 2;
  const binHz = sampleRateHz / n;

  const levels: number[] = [0];
  for (let k = 1; k <= maxLevel; k++) {
    levels.push(k);
    if (k < maxLevel) levels.push(k + 0.6);
  }
  const bands: KurtogramBand[][] = [];
  const [searchLowHz, searchHighHz] = options.searchRangeHz ?? [0, sampleRateHz / 2];
  const minBandwidthHz = options.minBandwidthHz ?? 0;
  let best: KurtogramBand | null = null;
  for (const level of levels) {
    const k = Math.floor(level);
    const count = level === k ? 2 ** k : 3 * 2 ** (k - 1);
    const row: KurtogramBand[] = [];
    for (let b = 0; b < count; b++) {
      const i1 = Math.round((b * half) / count);
      const i2 = Math.round(((b + 1) * half) / count);
      const kurtosis = bandEnvelopeKurtosis(spectrum, i1, i2);
      const band: KurtogramBand = {
        level,
        index: b,
        lowHz: i1 * binHz,
        highHz: i2 * binHz,
        centerHz: ((i1 + i2) / 2) * binHz,
        bandwidthHz: (i2 - i1) * binHz,
        kurtosis,
      };
      row.push(band);
      const allowed = band.bandwidthHz >= minBandwidthHz && band.lowHz >= searchLowHz - 1e-9 && band.highHz <= searchHighHz + 1e-9;
      if (allowed && Number.isFinite(kurtosis) && (best === null || kurtosis > best.kurtosis)) best = band;
    }
    bands.push(row);
  }
  // When nothing fits the constraints, fall back to the best band of all (the caller sees its width).
  if (best === null) {
    for (const row of bands) for (const band of row) if (Number.isFinite(band.kurtosis) && (best === null || band.kurtosis > best.kurtosis)) best = band;
  }
  return { levels, bands, best: best ?? bands[0]![0]!, samplesUsed: n };
}

const EDGE_FRACTION = 0.05;

/** Kurtosis of the complex envelope of the bins [i1, i2) of a real signal's FFT (left half as fft.js fills it). */
function bandEnvelopeKurtosis(spectrum: Float64Array, i1: number, i2: number): number {
  const width = i2 - i1;
  if (width < 1) return Number.NaN;
  // Zero-padding the band to a power of two only interpolates the envelope in time; its moments are unchanged.
  const m = Math.max(16, nextPowerOfTwo(width));
  // Work arrays reused from band to band (a kurtogram transforms some 400 bands); the band's bins, then zeros.
  const band = scratchArray('diagnosis:kurtogram-band', 2 * m);
  band.set(spectrum.subarray(2 * i1, 2 * i2), 0);
  band.fill(0, 2 * width);
  const envelope = scratchArray('diagnosis:kurtogram-envelope', 2 * m);
  fftPlan(m).inverseTransform(envelope, band);
  // Skip the tapered ends (same fraction of the record: the envelope is the record at a lower rate).
  const from = Math.ceil(m * EDGE_FRACTION);
  const to = m - from;
  let m2 = 0;
  let m4 = 0;
  for (let i = from; i < to; i++) {
    const re = envelope[2 * i]!;
    const im = envelope[2 * i + 1]!;
    const p = re * re + im * im;
    m2 += p;
    m4 += p * p;
  }
  m2 /= to - from;
  m4 /= to - from;
  return m2 > 0 ? m4 / (m2 * m2) - 2 : Number.NaN;
}
