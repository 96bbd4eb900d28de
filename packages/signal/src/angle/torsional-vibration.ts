import { SignalInputError } from '../errors.js';
import type { SpectrumScaling, WindowName } from '../spectra/index.js';
import { orderSpectrum, type OrderSpectrum } from './order-spectrum.js';
import type { PulseSpeed } from './pulse-speed.js';

export interface TorsionalVibrationOptions {
  /** Unit of the angle fluctuation and its spectrum; default 'deg'. */
  angleUnit?: 'rad' | 'deg';
  /** Default 'peak'. */
  scaling?: SpectrumScaling;
  window?: WindowName;
  /** Whole revolutions per spectrum segment; default all. */
  segmentRevolutions?: number;
  /** Degree of the polynomial in time fitted to the shaft angle as its rigid-body motion; default 2 (constant acceleration). */
  trendDegree?: number;
}

export interface TorsionalVibration {
  pulsesPerRev: number;
  /** Whole revolutions analysed. */
  revolutions: number;
  meanSpeedHz: number;
  /** Angle of the shaft less its rigid-body angle, at each pulse (uniform in angle), in `angleUnit`. */
  angleFluctuation: Float64Array;
  angleUnit: 'rad' | 'deg';
  /** Angular velocity less its rigid-body trend over each pulse pitch, rad/s (uniform in angle, at mid-pitch). */
  angularVelocityFluctuationRadPerS: Float64Array;
  angleSpectrum: OrderSpectrum;
  velocitySpectrum: OrderSpectrum;
  /** How the velocity is averaged: over one pulse pitch, a gain of sin(πm/P)/(πm/P) at order m for P pulses per rev. */
  smoothing: string;
}

/**
 * Torsional vibration from encoder pulses. Pulse k marks the angle 2πk/P at time t_k; the rigid-body
 * motion is a low-degree polynomial θ(t) fitted by least squares, and the torsional angle is the
 * measured angle less that polynomial at each pulse. The angular velocity over each pitch is
 * (2π/P)/(t_{k+1} − t_k), less the rigid-body motion's mean velocity over the same interval. The pulses
 * are equally spaced in angle, so both are already angle-domain signals: their spectra are against
 * order of the encoder shaft.
 */
// Common practice (instantaneous angular speed from the elapsed time between encoder pulses); e.g. Y. Li, F. Gu, G. Harris, A. Ball et al., "The measurement of instantaneous angular speed", MSSP 19:786-805 (2005) (from memory).
export function torsionalVibration(pulses: PulseSpeed, options: TorsionalVibrationOptions = {}): TorsionalVibration {
  const ppr = pulses.pulsesPerRev;
  const angleUnit = options.angleUnit ?? 'deg';
  const degree = options.trendDegree ?? 2;
  if (!(Number.isInteger(degree) && degree >= 1 && degree <= 5)) throw new SignalInputError('invalid_parameter', `trendDegree (${degree}) must be a whole number from 1 to 5`);
  const times = uniformPulseTimes(pulses);
  const revolutions = Math.floor((times.length - 1) / ppr);
  if (revolutions < 2) throw new SignalInputError('too_few_pulses', `the encoder covers ${revolutions} whole revolution(s); torsional analysis needs at least 2`);
  const count = revolutions * ppr + 1;
  const t = times.subarray(0, count);
  const pitchRad = (2 * Math.PI) / ppr;
  // Rigid-body motion: θ(t) as a polynomial in t scaled to [-1, 1] (degree 2 is exact for constant acceleration).
  const t0 = t[0]!;
  const t1 = t[count - 1]!;
  const scaled = new Float64Array(count);
  for (let k = 0; k < count; k++) scaled[k] = (2 * (t[k]! - t0)) / (t1 - t0) - 1;
  const theta = new Float64Array(count);
  for (let k = 0; k < count; k++) theta[k] = k * pitchRad;
  const coefficients = leastSquaresPolynomial(scaled, theta, degree);
  const rigid = (k: number) => polynomial(coefficients, scaled[k]!);
  const toUnit = angleUnit === 'deg' ? 180 / Math.PI : 1;
  const angle = new Float64Array(count - 1);
  const velocity = new Float64Array(count - 1);
  for (let k = 0; k < count - 1; k++) {
    angle[k] = (theta[k]! - rigid(k)) * toUnit;
    // mean angular velocity over the pitch, less that of the rigid-body motion over the same time
    velocity[k] = (pitchRad - (rigid(k + 1) - rigid(k))) / (t[k + 1]! - t[k]!);
  }
  const spectrumOptions = {
    scaling: options.scaling ?? 'peak',
    window: options.window ?? 'hann',
    segmentRevolutions: options.segmentRevolutions ?? revolutions,
    detrend: 'mean' as const,
  };
  const meanSpeedHz = revolutions / (t[count - 1]! - t[0]!);
  return {
    pulsesPerRev: ppr,
    revolutions,
    meanSpeedHz,
    angleFluctuation: angle,
    angleUnit,
    angularVelocityFluctuationRadPerS: velocity,
    angleSpectrum: orderSpectrum({ samples: angle, samplesPerRev: ppr, revolutions }, { ...spectrumOptions, unit: angleUnit }),
    velocitySpectrum: orderSpectrum({ samples: velocity, samplesPerRev: ppr, revolutions }, { ...spectrumOptions, unit: 'rad/s' }),
    smoothing: `angular velocity averaged over one pulse pitch (1/${ppr} rev): gain sin(πm/${ppr})/(πm/${ppr}) at order m`,
  };
}

/** One time per pulse pitch from the first pulse on; pitches whose pulse was missing are filled by linear interpolation. */
function uniformPulseTimes(pulses: PulseSpeed): Float64Array {
  const { pulseIndex, pulseTimesS } = pulses;
  const total = pulseIndex[pulseIndex.length - 1]! + 1;
  const out = new Float64Array(total);
  for (let p = 0; p < pulseIndex.length; p++) {
    out[pulseIndex[p]!] = pulseTimesS[p]!;
    if (p > 0 && pulseIndex[p]! - pulseIndex[p - 1]! > 1) {
      const a = pulseIndex[p - 1]!;
      const b = pulseIndex[p]!;
      for (let k = a + 1; k < b; k++) out[k] = pulseTimesS[p - 1]! + ((k - a) / (b - a)) * (pulseTimesS[p]! - pulseTimesS[p - 1]!);
    }
  }
  return out;
}

/** Least-squares polynomial coefficients (ascending powers) of y against x in [-1, 1], by the normal equations. */
function leastSquaresPolynomial(xs: Float64Array, y: Float64Array, degree: number): number[] {
  const m = degree + 1;
  const A = Array.from({ length: m }, () => new Array<number>(m + 1).fill(0));
  for (let k = 0; k < y.length; k++) {
    const x = xs[k]!;
    const powers = [1];
    for (let p = 1; p < 2 * m; p++) powers.push(powers[p - 1]! * x);
    for (let r = 0; r < m; r++) {
      for (let c = 0; c < m; c++) A[r]![c] += powers[r + c]!;
      A[r]![m] += powers[r]! * y[k]!;
    }
  }
  // Gaussian elimination with partial pivoting.
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(A[r]![col]!) > Math.abs(A[pivot]![col]!)) pivot = r;
    [A[col], A[pivot]] = [A[pivot]!, A[col]!];
    for (let r = col + 1; r < m; r++) {
      const f = A[r]![col]! / A[col]![col]!;
      for (let c = col; c <= m; c++) A[r]![c] -= f * A[col]![c]!;
    }
  }
  const coefficients = new Array<number>(m).fill(0);
  for (let r = m - 1; r >= 0; r--) {
    let s = A[r]![m]!;
    for (let c = r + 1; c < m; c++) s -= A[r]![c]! * coefficients[c]!;
    coefficients[r] = s / A[r]![r]!;
  }
  return coefficients;
}

function polynomial(c: number[], x: number): number {
  let s = 0;
  for (let p = c.length - 1; p >= 0; p--) s = s * x + c[p]!;
  return s;
}

