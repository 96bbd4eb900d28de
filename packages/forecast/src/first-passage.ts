/** A first passage of Brownian motion with a normally distributed drift across a level `distance` above it. */
export interface FirstPassage {
  /** Distance from the current level to the threshold, in the model's scale (> 0). */
  distance: number;
  /** Mean m and variance v of the drift μ ~ N(m, v), per second and per s². */
  driftMeanPerS: number;
  driftVarPerS2: number;
  /** Diffusion σ² of the Brownian part, per second. */
  diffusionPerS: number;
}

/**
 * Density of the first passage time T of y(t) = μt + σB(t) across `distance` D, with μ ~ N(m, v) independent of B:
 * f(t) = D / √(2π t³ (v t + σ²)) · exp(−(D − m t)² / (2 t (v t + σ²)))
 * (X.-S. Si, W. Wang, C.-H. Hu, D.-H. Zhou, M. G. Pecht, "Remaining useful life estimation based on a nonlinear
 * diffusion degradation process", IEEE Trans. Reliability 61:50–67, 2012, the linear case). With v = 0 it is the
 * inverse Gaussian density of the fixed-drift passage (Chhikara & Folks 1989).
 */
export function firstPassageDensity(p: FirstPassage, tS: number): number {
  if (!(tS > 0)) return 0;
  const s = p.driftVarPerS2 * tS + p.diffusionPerS;
  const e = p.distance - p.driftMeanPerS * tS;
  return (p.distance / Math.sqrt(2 * Math.PI * tS * tS * tS * s)) * Math.exp(-(e * e) / (2 * tS * s));
}

/** The distribution function of a first passage tabulated up to a horizon: P(T ≤ timesS[i]) = cdf[i]. */
export interface PassageTable {
  timesS: Float64Array;
  cdf: Float64Array;
}

/** Grid points of the table: spacing of about 1 % in time over twelve decades, far finer than any interval reported. */
const TABLE_POINTS = 2400;
/** Points added around the most likely passage time, across ±PEAK_WIDTHS of its spread. */
const PEAK_POINTS = 600;
const PEAK_WIDTHS = 10;

/**
 * P(T ≤ t) for t up to `horizonS`, by the trapezoidal rule on a logarithmic time grid (the density is smooth in
 * ln t) starting well below the diffusion time D²/σ², before which the passage is vanishingly unlikely. A passage
 * of nearly certain drift and little diffusion is a peak narrower than that grid: a dense grid is laid across
 * the peak as well, at D/m ± 10 spreads (delta method: var T ≈ Dσ²/m³ + (D/m²)²·v).
 */
export function passageTable(p: FirstPassage, horizonS: number): PassageTable {
  const diffusionTimeS = (p.distance * p.distance) / p.diffusionPerS;
  const lowS = Math.max(1e-9, 1e-4 * Math.min(diffusionTimeS, horizonS));
  const grid: number[] = [];
  const step = Math.log(horizonS / lowS) / (TABLE_POINTS - 1);
  for (let i = 0; i < TABLE_POINTS; i++) grid.push(lowS * Math.exp(i * step));
  const m = p.driftMeanPerS;
  if (m > 0) {
    const modeS = p.distance / m;
    const sdS = Math.sqrt((p.distance * p.diffusionPerS) / m ** 3 + (p.distance / (m * m)) ** 2 * p.driftVarPerS2);
    const from = Math.max(lowS, modeS - PEAK_WIDTHS * sdS);
    const to = Math.min(horizonS, modeS + PEAK_WIDTHS * sdS);
    if (to > from) for (let i = 0; i <= PEAK_POINTS; i++) grid.push(from + ((to - from) * i) / PEAK_POINTS);
  }
  grid.sort((a, b) => a - b);
  const timesS = Float64Array.from(grid);
  const cdf = new Float64Array(timesS.length);
  let previous = firstPassageDensity(p, timesS[0]!);
  for (let i = 1; i < timesS.length; i++) {
    const f = firstPassageDensity(p, timesS[i]!);
    cdf[i] = cdf[i - 1]! + 0.5 * (f + previous) * (timesS[i]! - timesS[i - 1]!);
    previous = f;
  }
  return { timesS, cdf };
}

/** The time by which the passage has happened with probability q, or null when that is beyond the table. */
export function passageQuantile(table: PassageTable, q: number): number | null {
  const { timesS, cdf } = table;
  const last = cdf.length - 1;
  if (!(cdf[last]! >= q)) return null;
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (cdf[mid]! < q) lo = mid;
    else hi = mid;
  }
  const c0 = cdf[lo]!;
  const c1 = cdf[hi]!;
  if (c1 <= c0) return timesS[hi]!;
  // interpolate in ln t
  const f = (q - c0) / (c1 - c0);
  return Math.exp(Math.log(timesS[lo]!) + f * (Math.log(timesS[hi]!) - Math.log(timesS[lo]!)));
}

/** P(T ≤ tS) read from the table (0 before its first point, its last value after the horizon). */
export function passageProbability(table: PassageTable, tS: number): number {
  const { timesS, cdf } = table;
  if (tS <= timesS[0]!) return 0;
  if (tS >= timesS[timesS.length - 1]!) return cdf[cdf.length - 1]!;
  let lo = 0;
  let hi = timesS.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (timesS[mid]! < tS) lo = mid;
    else hi = mid;
  }
  const f = Math.log(tS / timesS[lo]!) / Math.log(timesS[hi]! / timesS[lo]!);
  return cdf[lo]! + f * (cdf[hi]! - cdf[lo]!);
}
