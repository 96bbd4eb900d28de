import { spectraError } from './spectra-error.js';
import { complexFft, largestPowerOfTwoAtMost } from './fft.js';
import type { Spectrum } from './spectrum.js';
import { assertFiniteSamples, assertSampleRate, welchSpectrum } from './welch.js';

/** A demodulation band of Antoni's 1/3-binary paving. */
export interface DemodulationBand {
  lowHz: number;
  highHz: number;
  /** Level of the paving: 1, 1.6, 2, 2.6, ... (bands of width fs/2^(level+1), or fs/(3·2^level) at level + 0.6). */
  level: number;
}

export interface BandPavingOptions {
  /** Bands narrower than this are left out (an envelope band must hold the fault's modulation sidebands). */
  minBandwidthHz: number;
  /** Bands reaching above this are left out; default 0.45 × fs (clear of a recorder's anti-alias roll-off). */
  topHz?: number;
  /** Bands starting below this are left out; default the first band of each level (the one at 0 Hz). */
  lowestHz?: number;
}

/**
 * The bands of the fast kurtogram's 1/3-binary paving of the (frequency, bandwidth) plane: at level k, 2^k bands
 * of width fs/2^(k+1); at level k + 0.6, 3·2^(k−1) bands of width fs/(3·2^k), from level 1 down to the narrowest
 * allowed. Bands that touch 0 Hz carry the running lines themselves rather than a resonance, and are left out.
 */
// J. Antoni, "Fast computation of the kurtogram for the detection of transient faults", MSSP 21:108–124 (2007).
export function bandPaving(sampleRateHz: number, options: BandPavingOptions): DemodulationBand[] {
  assertSampleRate(sampleRateHz);
  const topHz = options.topHz ?? 0.45 * sampleRateHz;
  const minBandwidthHz = options.minBandwidthHz;
  if (!(minBandwidthHz > 0)) throw spectraError('invalid_band', `minBandwidthHz (${minBandwidthHz}) must be > 0`);
  const out: DemodulationBand[] = [];
  for (let k = 1; k <= 16; k++) {
    let any = false;
    for (const [count, level] of [[2 ** k, k], [3 * 2 ** (k - 1), k + 0.6]] as const) {
      const width = sampleRateHz / 2 / count;
      if (width < minBandwidthHz) continue;
      any = true;
      for (let i = 1; i < count; i++) {
        const lowHz = i * width;
        const highHz = (i + 1) * width;
        if (highHz > topHz * (1 + 1e-12) || lowHz < (options.lowestHz ?? 0)) continue;
        out.push({ lowHz, highHz, level });
      }
    }
    if (!any) break;
  }
  return out;
}

export interface BandEnvelopeOptions {
  /** Resolution wanted of the envelope spectrum, Hz (its Welch segment is the power of two nearest above fs_env/resolution). */
  resolutionHz: number;
  /** Unit of the samples; the envelope spectrum is in unit^2 (squared envelope). */
  unit?: string;
}

/**
 * The squared-envelope spectra of many bands of one record, computed from a single transform of the record: for
 * each band, the one-sided spectrum lines inside it (doubled, as for an analytic signal) are shifted to baseband and
 * inverse-transformed at the smallest power-of-two length that holds them twice over, which gives the band's
 * complex envelope already down-sampled without aliasing of its squared magnitude; the squared envelope's Welch
 * spectrum (Hann, 50 % overlap, peak scaling) follows, truncated to the cyclic frequencies the band can hold (its
 * width). Randall & Antoni, "Rolling element bearing diagnostics — a tutorial", MSSP 25:485–520 (2011), §3: the
 * squared envelope of an ideal band-pass obtained by inverse-transforming a one-sided band of the spectrum.
 * The record's ends are tapered (5 % cosine) so that their jump does not ring every band as a false impact.
 */
export class BandEnvelopes {
  readonly sampleRateHz: number;
  /** Samples analysed (at most `maxSamples`, from the start of the record). */
  readonly samplesUsed: number;
  private readonly transformLength: number;
  private readonly spectrum: Float64Array;

  constructor(samples: Float64Array, sampleRateHz: number, options: { maxSamples?: number } = {}) {
    assertSampleRate(sampleRateHz);
    assertFiniteSamples(samples);
    if (samples.length < 64) throw spectraError('record_too_short', `the record has ${samples.length} samples; band envelopes need at least 64`);
    this.sampleRateHz = sampleRateHz;
    const used = Math.min(samples.length, options.maxSamples ?? samples.length);
    this.samplesUsed = used;
    let n = 1;
    while (n < used) n *= 2;
    this.transformLength = n;
    let mean = 0;
    for (let i = 0; i < used; i++) mean += samples[i]!;
    mean /= used;
    const taper = Math.max(1, Math.floor(used * TAPER_FRACTION));
    const frame = new Float64Array(n);
    for (let i = 0; i < used; i++) {
      const w = i < taper ? 0.5 - 0.5 * Math.cos((Math.PI * i) / taper) : i >= used - taper ? 0.5 - 0.5 * Math.cos((Math.PI * (used - 1 - i)) / taper) : 1;
      frame[i] = (samples[i]! - mean) * w;
    }
    const data = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) data[2 * i] = frame[i]!;
    this.spectrum = new Float64Array(2 * n);
    complexFft(n).forward(this.spectrum, data);
  }

  /** Frequency spacing of the record's transform, Hz. */
  get lineSpacingHz(): number {
    return this.sampleRateHz / this.transformLength;
  }

  /** The squared envelope of the band, down-sampled: its samples and their rate. */
  squaredEnvelope(band: { lowHz: number; highHz: number }): { samples: Float64Array; sampleRateHz: number } {
    const n = this.transformLength;
    const df = this.lineSpacingHz;
    const k1 = Math.max(1, Math.ceil(band.lowHz / df));
    const k2 = Math.min(n / 2 - 1, Math.floor(band.highHz / df));
    const lines = k2 - k1 + 1;
    if (lines < 1) throw spectraError('empty_band', `band [${band.lowHz}, ${band.highHz}] Hz holds no spectral line (lines every ${df} Hz)`);
    let m = 2;
    while (m < 2 * lines) m *= 2;
    const shifted = new Float64Array(2 * m);
    for (let k = k1; k <= k2; k++) {
      shifted[2 * (k - k1)] = 2 * this.spectrum[2 * k]!;
      shifted[2 * (k - k1) + 1] = 2 * this.spectrum[2 * k + 1]!;
    }
    const z = new Float64Array(2 * m);
    complexFft(m).inverse(z, shifted);
    // The inverse transform of length m divides by m; the record's own inverse would divide by n.
    const scale = (m / n) ** 2;
    const out = new Float64Array(m);
    for (let i = 0; i < m; i++) out[i] = (z[2 * i]! ** 2 + z[2 * i + 1]! ** 2) * scale;
    return { samples: out, sampleRateHz: (this.sampleRateHz * m) / n };
  }

  /**
   * The Welch spectrum (Hann, 50 % overlap, peak scaling, unit²) of the band's squared envelope, up to the band's
   * width (a band of width B carries modulation up to B and nothing above it), and the kurtosis of the band's
   * complex envelope, <|c|⁴>/<|c|²>² − 2 (0 for Gaussian noise; Antoni 2007's spectral kurtosis of the band), over
   * the untapered part of the record.
   */
  analyseBand(band: { lowHz: number; highHz: number }, options: BandEnvelopeOptions): { spectrum: Spectrum; kurtosis: number } {
    if (!(options.resolutionHz > 0)) throw spectraError('invalid_band', `resolutionHz (${options.resolutionHz}) must be > 0`);
    const env = this.squaredEnvelope(band);
    const m = env.samples.length;
    const skip = Math.ceil(m * TAPER_FRACTION * (this.samplesUsed / this.transformLength));
    const end = Math.floor(m * (this.samplesUsed / this.transformLength)) - skip;
    let s1 = 0;
    let s2 = 0;
    let count = 0;
    for (let i = skip; i < end; i++) {
      const e = env.samples[i]!;
      s1 += e;
      s2 += e * e;
      count++;
    }
    const kurtosis = count > 0 && s1 > 0 ? (s2 / count) / ((s1 / count) ** 2) - 2 : 0;
    let segment = 16;
    while (segment < m && env.sampleRateHz / segment > options.resolutionHz) segment *= 2;
    // The record's zero-padded tail carries no signal: the segments stop where the record does.
    const usable = Math.max(16, Math.min(m, Math.ceil(m * (this.samplesUsed / this.transformLength))));
    segment = Math.min(segment, largestPowerOfTwoAtMost(usable));
    const full = welchSpectrum(env.samples.subarray(0, usable), env.sampleRateHz, { segmentLength: segment, overlapFraction: 0.5, scaling: 'peak', window: 'hann', unit: options.unit ?? '' });
    const widthHz = band.highHz - band.lowHz;
    let keep = full.frequenciesHz.length;
    while (keep > 2 && full.frequenciesHz[keep - 1]! > widthHz) keep--;
    const spectrum = keep === full.frequenciesHz.length ? full : { ...full, frequenciesHz: full.frequenciesHz.slice(0, keep), values: full.values.slice(0, keep) };
    return { spectrum, kurtosis };
  }

  /** The band's squared-envelope spectrum alone (see analyseBand). */
  envelopeSpectrum(band: { lowHz: number; highHz: number }, options: BandEnvelopeOptions): Spectrum {
    return this.analyseBand(band, options).spectrum;
  }
}

/** Share of the analysed record tapered at each end. */
const TAPER_FRACTION = 0.05;
