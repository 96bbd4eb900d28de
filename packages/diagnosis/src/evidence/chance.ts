/**
 * How likely a matched line is to be chance: a peak that strong met inside the line's search window in a spectrum
 * that has peaks everywhere. Every score of this package starts from these probabilities, so that a pattern found
 * in a spectrum dense with peaks counts for little and a pattern standing alone counts for much.
 */

/** The peaks of a spectrum around a frequency that bear on chance: their SNR (dB) and how wide the searched region was. */
export interface Neighbourhood {
  /** SNR (dB) of every local maximum in the region, strongest first. */
  peakSnrDb: number[];
  /** Bins in the region (excluded bins not counted). */
  widthBins: number;
}

/** A neighbourhood reduced to what chanceOfPeak reads (see there): its peaks and the tail fitted over the strongest. */
export interface ChanceModel {
  peakSnrDb: number[];
  widthBins: number;
  /** Peaks in the tail (0 when the neighbourhood has too few peaks to fit one). */
  tailPeaks: number;
  tailThresholdDb: number;
  tailMeanExcessDb: number;
}

/** Fits the peaks-over-threshold tail of a neighbourhood once, for many chanceOfPeak calls. */
export function chanceModel(neighbourhood: Neighbourhood): ChanceModel {
  const peaks = neighbourhood.peakSnrDb;
  const widthBins = Math.max(1, neighbourhood.widthBins);
  if (peaks.length < MIN_TAIL_PEAKS) return { peakSnrDb: peaks, widthBins, tailPeaks: 0, tailThresholdDb: Infinity, tailMeanExcessDb: PRIOR_EXCESS_DB };
  const m = Math.max(5, Math.ceil(TAIL_SHARE * peaks.length));
  const u = peaks[m - 1]!;
  let excess = PRIOR_EXCESS_DB * PRIOR_PEAKS;
  for (let i = 0; i < m; i++) excess += peaks[i]! - u;
  return { peakSnrDb: peaks, widthBins, tailPeaks: m, tailThresholdDb: u, tailMeanExcessDb: excess / (m + PRIOR_PEAKS) };
}

/**
 * Probability that the strongest of `windowBins` bins reaches `snrDb` by chance, given the neighbourhood's peaks:
 * a Poisson count of peaks at least that strong, at the neighbourhood's density λ(s) per bin, over the window,
 * p = 1 − exp(−λ(s)·w).
 * λ(s) is the empirical density where the neighbourhood holds peaks that strong. Beyond its strongest peaks it is
 * extrapolated by the peaks-over-threshold method: the excess in dB of the neighbourhood's strongest tenth (at least
 * five) over their threshold is taken as exponential, λ(s) = λ(u)·exp(−(s − u)/μ) (Pickands, Ann. Stat. 3:119–131,
 * 1975; Davison & Smith, JRSS B 52:393–442, 1990, with shape 0). An exponential tail in dB is a power-law tail in
 * power: heavier than Gaussian noise's, so that spectra with many strong lines keep a line strong by itself from
 * counting as a certainty. μ carries two pseudo-peaks 6 dB over the threshold, so that a quiet neighbourhood of a
 * few peaks does not make every line over it look impossible. With fewer than MIN_TAIL_PEAKS peaks there is no
 * tail to fit: λ = (n(s) + 1)/width, the add-one estimate, which never claims a density under one peak per region.
 */
export function chanceOfPeak(model: ChanceModel | Neighbourhood, snrDb: number, windowBins: number): number {
  const m = 'tailPeaks' in model ? model : chanceModel(model);
  const peaks = m.peakSnrDb;
  const w = Math.max(1, windowBins);
  let lambda: number;
  if (m.tailPeaks === 0) {
    lambda = (countAtLeast(peaks, snrDb) + 1) / m.widthBins;
  } else if (snrDb <= m.tailThresholdDb) {
    lambda = countAtLeast(peaks, snrDb) / m.widthBins;
  } else {
    lambda = (m.tailPeaks / m.widthBins) * Math.exp(-(snrDb - m.tailThresholdDb) / m.tailMeanExcessDb);
  }
  return Math.min(1, Math.max(MIN_CHANCE, 1 - Math.exp(-lambda * w)));
}

/** Peaks (sorted strongest first) at least `snrDb` strong, by bisection. */
function countAtLeast(sortedDescending: readonly number[], snrDb: number): number {
  let lo = 0;
  let hi = sortedDescending.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sortedDescending[mid]! >= snrDb) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Below this many peaks a neighbourhood has no tail to fit. */
const MIN_TAIL_PEAKS = 20;
/** Share of a neighbourhood's peaks that make its tail. */
const TAIL_SHARE = 0.1;
/** Prior of the tail's mean excess: PRIOR_PEAKS pseudo-peaks PRIOR_EXCESS_DB over the threshold. */
const PRIOR_EXCESS_DB = 6;
const PRIOR_PEAKS = 2;
/** Smallest chance a single line is given (a line is a line: 1e-12 keeps logarithms finite). */
const MIN_CHANCE = 1e-12;

/**
 * Fisher's combined probability of `lineCount` independent tests whose chances are `chances` (the others found
 * nothing, chance 1): X = −2 Σ ln pᵢ is χ² with 2·lineCount degrees of freedom under the null (R. A. Fisher,
 * Statistical Methods for Research Workers, 1932, §21.1). For even degrees of freedom the χ² survival function has
 * the closed form e^(−X/2) Σ_{i<k} (X/2)^i / i!.
 */
export function fisherCombined(chances: readonly number[], lineCount: number): number {
  const k = Math.max(lineCount, chances.length);
  if (k === 0) return 1;
  let x = 0;
  for (const p of chances) x += -2 * Math.log(Math.max(p, MIN_CHANCE));
  const half = x / 2;
  // Summed in logs: the terms run far beyond double range for strong evidence.
  let logTerm = -half;
  let logSum = logTerm;
  for (let i = 1; i < k; i++) {
    logTerm += Math.log(half) - Math.log(i);
    logSum = logAdd(logSum, logTerm);
  }
  return Math.min(1, Math.exp(logSum));
}

function logAdd(a: number, b: number): number {
  const hi = Math.max(a, b);
  return hi + Math.log(Math.exp(a - hi) + Math.exp(b - hi));
}

/**
 * Probability corrected for the search that found it: the best of `trials` looks (bands, slips), Šidák's
 * 1 − (1 − p)^trials (exact for independent looks, conservative for the correlated ones a search makes).
 */
export function correctedForSearch(p: number, trials: number): number {
  if (trials <= 1) return p;
  // 1 − (1 − p)^n without cancellation for small p.
  return Math.min(1, -Math.expm1(trials * Math.log1p(-Math.min(p, 1 - 1e-16))));
}

/**
 * Upper bound of the Bayes factor a p-value can carry against its null, B ≤ 1/(−e·p·ln p) for p < 1/e (Sellke,
 * Bayarri & Berger, "Calibration of p values for testing precise null hypotheses", Am. Stat. 55:62–71, 2001).
 */
export function bayesFactorBound(p: number): number {
  if (!(p < 1 / Math.E)) return 1;
  const q = Math.max(p, 1e-300);
  return 1 / (-Math.E * q * Math.log(q));
}

/**
 * The evidence a probability gives, 0..1: B/(B + B½), with B the Sellke–Bayarri–Berger bound and B½ = 50 the Bayes
 * factor that makes 0.5. Kass & Raftery (JASA 90:773–795, 1995) call 20–150 "strong" evidence; 50 sits in the
 * middle of that range on a log scale. It corresponds to p ≈ 1e-3 after the search correction, so that of some fifty
 * fault hypotheses of a machine, chance alone shows one in about twenty recordings at most.
 */
export function evidenceOf(p: number): number {
  const b = bayesFactorBound(p);
  return b / (b + EVIDENCE_HALF_BAYES_FACTOR);
}

export const EVIDENCE_HALF_BAYES_FACTOR = 50;
