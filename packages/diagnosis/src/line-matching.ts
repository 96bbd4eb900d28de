import { interpolatePeak, windowAmplitudeResponse, type PeakInterpolation, type Spectrum } from '@kinespec/signal';

/** A line the model predicts, to be looked for in a measured spectrum. */
export interface ExpectedLine {
  frequencyHz: number;
  /** Predicted amplitude in the spectrum's scaling and unit (only ratios between lines matter for matching). */
  amplitude: number;
  label: string;
  /** The line's frequency over the reference shaft's speed; sets how far a speed error moves it. */
  order: number;
  /** Extra relative spread of the line's frequency, e.g. 0.01–0.02 for rolling-element slip. */
  relativeSpreadFraction?: number;
  /** Bins the line may lie from its prediction beyond the speed's uncertainty and its spread; default 1 (see lineToleranceHz). */
  toleranceBins?: number;
  /**
   * The tone found must also lie within three standard deviations of an interpolated frequency at its own SNR
   * (toneFrequencySigmaBins), not only within `toleranceBins`: for lines placed exactly by the speed (running lines).
   */
  snrTolerance?: boolean;
}

/**
 * Standard deviation, in bins, of a tone's frequency read from a Hann-windowed spectrum at `snrDb` over the floor.
 * The Cramér–Rao bound for one sinusoid in white noise is var(ω) = 12/(ρ·N³) (Rife & Boorstyn, IEEE Trans. IT 20:591–598,
 * 1974), ρ the per-sample SNR; a Hann peak bin holds ρ·N/3 over its noise (coherent gain 0.5, Σw²/N = 0.375), so in bins
 * σ = √(2/SNR_bin)/(2π) = 0.225/√SNR_bin. Three times that allows for the window's and the 3-point interpolation's loss
 * against the bound and for a floor read as a median: simulated tones at 10 and 20 dB scatter 1–3 times the bound
 * (line-matching.test.ts).
 */
export function toneFrequencySigmaBins(snrDb: number): number {
  return (3 * Math.sqrt(2)) / (2 * Math.PI) / Math.sqrt(10 ** (snrDb / 10));
}

export interface LineMatch {
  label: string;
  predictedHz: number;
  predictedAmplitude: number;
  toleranceHz: number;
  /** Interpolated frequency and amplitude of the peak found, null when no peak stands above the threshold. */
  measuredHz: number | null;
  measuredAmplitude: number | null;
  /**
   * Power of the best local maximum within the tolerance over the local noise floor, dB; when no local maximum
   * lies there, the level of the bin nearest the prediction. Reported for unmatched lines too (it bounds them).
   */
  snrDb: number;
  matched: boolean;
  /** Amplitude at the prediction for an unmatched line: the larger of the floor and the bin nearest it. */
  upperBoundAmplitude: number;
}

/** A measured spectrum prepared for line matching: its local noise floor and per-bin SNR, computed once. */
export interface MatchableSpectrum {
  spectrum: Spectrum;
  floor: Float64Array;
  /** 10·log10(bin power / floor power) per bin. */
  snrDb: Float64Array;
  /** Bins that are local maxima (v[k] > v[k−1] and v[k] >= v[k+1]), ascending. */
  maxima: Int32Array;
  /** Per-bin results shared by every hypothesis matched on this spectrum (interpolation, leakage test). */
  readonly memo: { peaks: Map<number, PeakInterpolation>; leakage: Map<number, boolean> };
}

/** Pairs a spectrum with its noise floor (any estimate in the same scaling, e.g. a running median). */
export function matchableSpectrum(spectrum: Spectrum, floor: Float64Array): MatchableSpectrum {
  const n = spectrum.values.length;
  const v = spectrum.values;
  const snrDb = new Float64Array(n);
  // A bin and the floor under it share the bin's pairing (DC, Nyquist), so their power ratio is the ratio of
  // the values, squared for amplitude scalings.
  const dbPerDecade = spectrum.scaling === 'peak' || spectrum.scaling === 'rms' ? 20 : 10;
  for (let k = 0; k < n; k++) {
    const p = v[k]!;
    const q = floor[k]!;
    snrDb[k] = q > 0 && p > 0 ? dbPerDecade * Math.log10(p / q) : p > 0 ? 60 : 0;
  }
  const maxima: number[] = [];
  for (let k = 1; k < n - 1; k++) if (v[k]! > v[k - 1]! && v[k]! >= v[k + 1]!) maxima.push(k);
  return { spectrum, floor, snrDb, maxima: Int32Array.from(maxima), memo: { peaks: new Map(), leakage: new Map() } };
}

export interface ToleranceOptions {
  frequencyResolutionHz: number;
  /** Standard uncertainty of the reference shaft's speed, Hz. */
  speedUncertaintyHz: number;
}

/**
 * How far from its prediction a line may be found: one bin (the peak bin of a tone lies within half a bin
 * of it, and noise moves it by a fraction more), plus three standard uncertainties of the speed times the
 * line's order (a speed error δ moves the n-th order by n·δ), plus any physical spread of the line itself.
 */
export function lineToleranceHz(line: Pick<ExpectedLine, 'frequencyHz' | 'order' | 'relativeSpreadFraction' | 'toleranceBins'>, options: ToleranceOptions): number {
  return (line.toleranceBins ?? 1) * options.frequencyResolutionHz + 3 * Math.abs(line.order) * options.speedUncertaintyHz + (line.relativeSpreadFraction ?? 0) * line.frequencyHz;
}

/**
 * Looks for a predicted line: the highest local maximum of the spectrum whose bin lies within the tolerance,
 * with its window-aware interpolated frequency and amplitude (@kinespec/signal interpolatePeak). It counts as
 * matched when it stands `minSnrDb` above the local noise floor.
 */
export function matchLine(measured: MatchableSpectrum, line: ExpectedLine, toleranceHz: number, minSnrDb = 6): LineMatch {
  const { spectrum, snrDb, floor } = measured;
  const v = spectrum.values;
  const df = spectrum.frequencyResolutionHz;
  const last = v.length - 2;
  const lo = Math.max(1, Math.ceil((line.frequencyHz - toleranceHz) / df));
  const hi = Math.min(last, Math.floor((line.frequencyHz + toleranceHz) / df));
  const nearest = Math.min(Math.max(1, Math.round(line.frequencyHz / df)), v.length - 1);
  let best = -1;
  const maxima = measured.maxima;
  for (let i = firstAtOrAbove(maxima, lo); i < maxima.length && maxima[i]! <= hi; i++) {
    const k = maxima[i]!;
    if (k <= last && (best < 0 || v[k]! > v[best]!) && !leakageAt(measured, k)) best = k;
  }
  const peak = best >= 0 && snrDb[best]! >= minSnrDb ? peakAt(measured, best) : null;
  // The peak bin may lie within the tolerance while the tone it holds (interpolated) lies beyond it.
  // (Plain object literals of one shape: spreading a common part costs more than the matching itself.)
  let allowedHz = toleranceHz + 0.1 * df;
  if (peak && line.snrTolerance) {
    // The window part of the tolerance shrinks to three standard deviations of the tone's own frequency (at least a tenth of a bin).
    const windowBins = line.toleranceBins ?? 1;
    const ownBins = Math.min(windowBins, Math.max(0.1, 3 * toneFrequencySigmaBins(snrDb[best]!)));
    allowedHz = toleranceHz - windowBins * df + ownBins * df + 0.1 * df;
  }
  if (peak && Math.abs(peak.frequencyHz - line.frequencyHz) <= allowedHz) {
    return {
      label: line.label,
      predictedHz: line.frequencyHz,
      predictedAmplitude: line.amplitude,
      toleranceHz,
      measuredHz: peak.frequencyHz,
      measuredAmplitude: peak.amplitude,
      snrDb: snrDb[best]!,
      matched: true,
      upperBoundAmplitude: peak.amplitude,
    };
  }
  const at = best >= 0 ? best : nearest;
  return {
    label: line.label,
    predictedHz: line.frequencyHz,
    predictedAmplitude: line.amplitude,
    toleranceHz,
    measuredHz: null,
    measuredAmplitude: null,
    snrDb: nearest < v.length ? snrDb[at]! : 0,
    matched: false,
    upperBoundAmplitude: nearest < v.length ? Math.max(floor[nearest]!, v[nearest]!) : 0,
  };
}

/** Index of the first element of an ascending array that is >= value (its length when none is). */
export function firstAtOrAbove(sorted: Int32Array, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The local maxima standing `minSnrDb` over the floor that are not window leakage, strongest first, at most
 * `count`, with their interpolated frequency and amplitude (the noise floor is the spectrum's own, computed once).
 */
export function strongPeaks(measured: MatchableSpectrum, minSnrDb: number, count: number): Array<{ bin: number; frequencyHz: number; amplitude: number }> {
  const above: number[] = [];
  for (const k of measured.maxima) if (measured.snrDb[k]! >= minSnrDb) above.push(k);
  above.sort((a, b) => measured.spectrum.values[b]! - measured.spectrum.values[a]!);
  const out: Array<{ bin: number; frequencyHz: number; amplitude: number }> = [];
  for (const k of above) {
    if (out.length >= count) break;
    if (!leakageAt(measured, k)) out.push({ bin: k, ...peakAt(measured, k) });
  }
  return out;
}

/** interpolatePeak at bin k of the measured spectrum, computed once per spectrum and bin. */
export function peakAt(measured: MatchableSpectrum, k: number): PeakInterpolation {
  let p = measured.memo.peaks.get(k);
  if (!p) {
    p = interpolatePeak(measured.spectrum, k);
    measured.memo.peaks.set(k, p);
  }
  return p;
}

/** Whether the local maximum at bin k is only window leakage of a stronger line nearby (computed once per bin). */
export function isLeakagePeak(measured: MatchableSpectrum, k: number): boolean {
  return leakageAt(measured, k);
}

function leakageAt(measured: MatchableSpectrum, k: number): boolean {
  let l = measured.memo.leakage.get(k);
  if (l === undefined) {
    l = isLeakage(measured.spectrum, k);
    measured.memo.leakage.set(k, l);
  }
  return l;
}

/** How far (bins) a strong line's window sidelobes are checked for. */
const LEAKAGE_REACH_BINS = 8;

/**
 * True when bin k is a local maximum only because a much stronger line nearby leaks into it through the
 * window's sidelobes (Hann's highest sidelobe is −31.5 dB at ±2.5 bins, Harris 1978): its value is less than
 * twice (6 dB over) what the window response of that neighbour predicts at this distance.
 */
function isLeakage(spectrum: Spectrum, k: number): boolean {
  const v = spectrum.values;
  const amplitudeLike = spectrum.scaling === 'peak' || spectrum.scaling === 'rms';
  for (let j = Math.max(1, k - LEAKAGE_REACH_BINS); j <= Math.min(v.length - 2, k + LEAKAGE_REACH_BINS); j++) {
    if (j === k || !(v[j]! > v[k]!) || !(v[j]! >= v[j - 1]! && v[j]! >= v[j + 1]!)) continue;
    // The neighbour's tone may sit up to half a bin towards k: take the response half a bin closer.
    const offset = Math.max(0, Math.abs(k - j) - 0.5);
    const gain = windowAmplitudeResponse(spectrum.window, offset, spectrum.segmentLength);
    const leak = v[j]! * (amplitudeLike ? gain : gain * gain);
    if (v[k]! < (amplitudeLike ? 2 : 4) * leak) return true;
  }
  return false;
}
