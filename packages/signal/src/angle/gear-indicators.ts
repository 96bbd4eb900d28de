import { SignalInputError } from '../errors.js';
import { inverseComplexSpectrum, realToComplexSpectrum } from '../spectra/index.js';

export interface GearIndicatorOptions {
  /** Teeth of the gear on the averaged shaft: its mesh is order `teeth` of one revolution. */
  teeth: number;
  /** Mesh harmonics in the regular signal; default every one below `maxOrder`. */
  meshHarmonics?: number;
  /** Highest order the average holds (the anti-alias pass band); default half the samples per revolution. */
  maxOrder?: number;
  /**
   * Low shaft orders (1 … k) removed with the mesh harmonics from the residual and difference signals;
   * default 3. In a one-revolution average every line is a shaft harmonic, so only the lowest
   * (unbalance, eccentricity, misalignment) count as regular; a local tooth fault spreads over all.
   */
  shaftHarmonics?: number;
  /** Variances of the residual signal of earlier records of this gear (the run history for NA4); default none. */
  residualVarianceHistory?: readonly number[];
}

export interface GearIndicators {
  /** Peak-to-peak of the average over the sum of mesh-harmonic amplitudes (Stewart 1977). */
  fm0: number;
  /** Kurtosis of the difference signal (Stewart 1977); about 3 for a healthy gear. */
  fm4: number;
  /** Kurtosis of the residual signal over the squared mean residual variance of the run (Zakrajsek et al. 1993). */
  na4: number;
  /** Peak amplitudes of mesh harmonics 1 … H, in the average's unit. */
  meshHarmonicAmplitudes: number[];
  /** Mesh harmonics only (with the mean): the regular meshing signal. */
  regular: Float64Array;
  /** Average less the mesh harmonics and the low shaft orders. */
  residual: Float64Array;
  /** Residual less the first-order sidebands of each mesh harmonic. */
  difference: Float64Array;
  residualVariance: number;
  rms: number;
  peakToPeak: number;
}

/**
 * Gear condition indicators of a one-revolution synchronous average (McFadden's "regular" signal
 * being the mesh harmonics), with the definitions of
 * J. J. Zakrajsek, D. P. Townsend & H. J. Decker, "An analysis of gear fault detection methods as applied to
 * pitting fatigue failure data", NASA TM-105950 (1993), after R. M. Stewart, "Some useful data analysis
 * techniques for gearbox diagnostics", Univ. of Southampton ISVR report MHM/R/10/77 (1977):
 * - FM0 = PP / Σ_{h=1}^{H} P_h (peak-to-peak over the mesh-harmonic amplitudes);
 * - FM4 = N·Σ(d − d̄)⁴ / [Σ(d − d̄)²]², d the difference signal;
 * - NA4 = N·Σ(r − r̄)⁴ / [(1/M)·Σ_j Σ_i (r_ij − r̄_j)²]², r the residual, M records of the run including this one.
 * (Both definitions and the report numbers from memory.)
 */
export function gearIndicators(average: Float64Array, options: GearIndicatorOptions): GearIndicators {
  const n = average.length;
  const { teeth } = options;
  if (!(Number.isInteger(teeth) && teeth >= 1)) throw new SignalInputError('invalid_parameter', `teeth (${teeth}) must be a whole number >= 1`);
  const nyquistOrder = Math.floor((n - 1) / 2);
  const maxOrder = Math.min(options.maxOrder ?? nyquistOrder, nyquistOrder);
  if (teeth + 1 > maxOrder) {
    throw new SignalInputError('order_above_band', `the mesh order ${teeth} (and its sidebands) lies above the average's highest order ${maxOrder.toFixed(1)}; resample with more samples per revolution`);
  }
  const harmonics = Math.min(options.meshHarmonics ?? Infinity, Math.floor(maxOrder / teeth));
  const shaftHarmonics = options.shaftHarmonics ?? 3;
  const X = realToComplexSpectrum(average);
  const keep = (orders: Set<number>) => {
    const Y = new Float64Array(2 * n);
    for (const k of orders) {
      for (const bin of k === 0 ? [0] : [k, n - k]) {
        Y[2 * bin] = X[2 * bin]!;
        Y[2 * bin + 1] = X[2 * bin + 1]!;
      }
    }
    const z = inverseComplexSpectrum(Y);
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = z[2 * i]!;
    return out;
  };
  const mesh = new Set<number>([0]);
  const meshHarmonicAmplitudes: number[] = [];
  for (let h = 1; h <= harmonics; h++) {
    mesh.add(h * teeth);
    // peak amplitude of a real line from its DFT bin: 2|X_k|/N
    meshHarmonicAmplitudes.push((2 * Math.hypot(X[2 * h * teeth]!, X[2 * h * teeth + 1]!)) / n);
  }
  const shaft = new Set<number>(mesh);
  for (let k = 1; k <= shaftHarmonics; k++) shaft.add(k);
  const sidebands = new Set<number>(shaft);
  for (let h = 1; h <= harmonics; h++) {
    sidebands.add(h * teeth - 1);
    if (h * teeth + 1 <= nyquistOrder) sidebands.add(h * teeth + 1);
  }
  const regular = keep(mesh);
  const removedForResidual = keep(shaft);
  const removedForDifference = keep(sidebands);
  const residual = new Float64Array(n);
  const difference = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    residual[i] = average[i]! - removedForResidual[i]!;
    difference[i] = average[i]! - removedForDifference[i]!;
  }
  let min = Infinity;
  let max = -Infinity;
  let sumSquares = 0;
  let mean = 0;
  for (const v of average) mean += v / n;
  for (const v of average) {
    if (v < min) min = v;
    if (v > max) max = v;
    sumSquares += (v - mean) ** 2;
  }
  const peakToPeak = max - min;
  const meshSum = meshHarmonicAmplitudes.reduce((a, b) => a + b, 0);
  const residualVariance = centralMoment(residual, 2);
  const history = options.residualVarianceHistory ?? [];
  const meanVariance = (history.reduce((a, b) => a + b, 0) + residualVariance) / (history.length + 1);
  return {
    // Stewart (1977): FM0 = PP / Σ P_h
    fm0: meshSum > 0 ? peakToPeak / meshSum : Number.NaN,
    // Stewart (1977): FM4 = normalised fourth moment of the difference signal
    fm4: centralMoment(difference, 4) / centralMoment(difference, 2) ** 2,
    // Zakrajsek, Townsend & Decker (1993): NA4 normalised by the run's mean residual variance
    na4: centralMoment(residual, 4) / meanVariance ** 2,
    meshHarmonicAmplitudes,
    regular,
    residual,
    difference,
    residualVariance,
    rms: Math.sqrt(sumSquares / n),
    peakToPeak,
  };
}

/** (1/N)·Σ(x − x̄)^p. */
function centralMoment(x: Float64Array, p: number): number {
  let mean = 0;
  for (const v of x) mean += v;
  mean /= x.length;
  let s = 0;
  for (const v of x) s += (v - mean) ** p;
  return s / x.length;
}
