import FFT from 'fft.js';
import { SignatureInputError } from './errors.js';

/*
 * A periodic excitation over one period of its fundamental. The period is 1 (a "fraction" of the
 * period, so one revolution for a shaft-synchronous excitation, one defect interval for a bearing).
 * The excitation is the SUM of its segments, each zero outside [startFraction, endFraction); all the
 * segments lie inside one window of length 1. Overlap is allowed on purpose: a mean torque, a drop
 * and a ripple are written as separate layers.
 *
 * Convention (stated once, used everywhere):
 *   f(θ) = a0 + Σ_{n≥1} a_n cos(2πnθ) + b_n sin(2πnθ) = a0 + Σ A_n cos(2πnθ + φ_n)
 *   c_n = ∫_period f(θ) e^{−j2πnθ} dθ = (a_n − j b_n)/2,  A_n = 2|c_n|,  φ_n = arg c_n.
 * a0 is the mean (not a0/2).
 */

interface Bounds {
  /** Start of the segment, in fractions of the period (may be negative: a window centred on 0). */
  startFraction: number;
  /** End of the segment (exclusive), in fractions of the period. */
  endFraction: number;
}

/** value over the segment */
export interface ConstantSegment extends Bounds {
  kind: 'constant';
  value: number;
}
/** straight line from startValue at startFraction to endValue at endFraction */
export interface LinearSegment extends Bounds {
  kind: 'linear';
  startValue: number;
  endValue: number;
}
/** offset + amplitude·cos(2π·cyclesPerPeriod·θ + phaseRad), θ measured from 0 (not from the segment start) */
export interface CosineSegment extends Bounds {
  kind: 'cosine';
  amplitude: number;
  cyclesPerPeriod: number;
  phaseRad: number;
  offset?: number;
}
/** startValue·e^{−decayPerPeriod·(θ − startFraction)}: the envelope of a damped impact */
export interface ExponentialSegment extends Bounds {
  kind: 'exponential';
  startValue: number;
  decayPerPeriod: number;
}

export type Segment = ConstantSegment | LinearSegment | CosineSegment | ExponentialSegment;

export interface FourierTerm {
  harmonic: number;
  /** Cosine coefficient a_n. */
  a: number;
  /** Sine coefficient b_n. */
  b: number;
  /** One-sided amplitude A_n = √(a_n² + b_n²) = 2|c_n|. */
  amplitude: number;
  /** φ_n in A_n·cos(2πnθ + φ_n), = arg c_n. */
  phaseRad: number;
}

export interface FourierSeries {
  /** The mean over one period. */
  a0: number;
  /** Harmonics 1..N, in order (terms[n − 1].harmonic === n). */
  terms: FourierTerm[];
}

const SPAN_TOLERANCE = 1e-9;
const MAX_HARMONICS = 1_000_000;

function checkHarmonics(harmonics: number, name = 'harmonics'): void {
  if (!Number.isInteger(harmonics) || harmonics < 0 || harmonics > MAX_HARMONICS) {
    throw new SignatureInputError('invalid_harmonics', `${name} (${harmonics}) must be a whole number from 0 to ${MAX_HARMONICS}`);
  }
}

function finite(value: number | undefined, name: string, i: number): void {
  if (value !== undefined && !Number.isFinite(value)) {
    throw new SignatureInputError('invalid_segment', `segments[${i}].${name} (${value}) must be a finite number`);
  }
}

/** Throws SignatureInputError unless every segment is well formed and all of them fit in one period. */
export function validateSegments(segments: readonly Segment[]): void {
  if (!Array.isArray(segments) || segments.length === 0) {
    throw new SignatureInputError('invalid_segment', 'segments must be a non-empty list');
  }
  let lo = Infinity;
  let hi = -Infinity;
  segments.forEach((s, i) => {
    finite(s.startFraction, 'startFraction', i);
    finite(s.endFraction, 'endFraction', i);
    if (!(s.endFraction > s.startFraction)) {
      throw new SignatureInputError('invalid_segment', `segments[${i}]: endFraction (${s.endFraction}) must be greater than startFraction (${s.startFraction})`);
    }
    switch (s.kind) {
      case 'constant': finite(s.value, 'value', i); break;
      case 'linear': finite(s.startValue, 'startValue', i); finite(s.endValue, 'endValue', i); break;
      case 'cosine':
        finite(s.amplitude, 'amplitude', i); finite(s.cyclesPerPeriod, 'cyclesPerPeriod', i);
        finite(s.phaseRad, 'phaseRad', i); finite(s.offset, 'offset', i);
        break;
      case 'exponential': finite(s.startValue, 'startValue', i); finite(s.decayPerPeriod, 'decayPerPeriod', i); break;
      default:
        throw new SignatureInputError('invalid_segment', `segments[${i}].kind (${String((s as { kind: unknown }).kind)}) must be 'constant', 'linear', 'cosine' or 'exponential'`);
    }
    lo = Math.min(lo, s.startFraction);
    hi = Math.max(hi, s.endFraction);
  });
  if (hi - lo > 1 + SPAN_TOLERANCE) {
    throw new SignatureInputError('segments_span', `segments span ${lo}..${hi} (${hi - lo} periods); they must fit in one period (length 1)`);
  }
}

/** The start of the one-period window the segments are written in. */
export function segmentsOrigin(segments: readonly Segment[]): number {
  return Math.min(...segments.map((s) => s.startFraction));
}

function segmentValue(s: Segment, theta: number): number {
  const u = theta - s.startFraction;
  switch (s.kind) {
    case 'constant': return s.value;
    case 'linear': return s.startValue + ((s.endValue - s.startValue) * u) / (s.endFraction - s.startFraction);
    case 'cosine': return (s.offset ?? 0) + s.amplitude * Math.cos(2 * Math.PI * s.cyclesPerPeriod * theta + s.phaseRad);
    case 'exponential': return s.startValue * Math.exp(-s.decayPerPeriod * u);
  }
}

/** The excitation at θ (any real θ; the waveform repeats with period 1). */
export function evaluateSegments(segments: readonly Segment[], theta: number, origin = segmentsOrigin(segments)): number {
  const t = origin + (((theta - origin) % 1) + 1) % 1;
  let sum = 0;
  for (const s of segments) if (t >= s.startFraction && t < s.endFraction) sum += segmentValue(s, t);
  return sum;
}

/** The excitation sampled at θ_i = origin + i/count, i = 0..count−1 (one period, endpoint excluded). */
export function sampleSegments(segments: readonly Segment[], count: number): Float64Array {
  validateSegments(segments);
  if (!Number.isInteger(count) || count < 1) {
    throw new SignatureInputError('invalid_samples', `count (${count}) must be a whole number >= 1`);
  }
  const origin = segmentsOrigin(segments);
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = evaluateSegments(segments, origin + i / count, origin);
  return out;
}

/*
 * ∫_0^L (p + q·u)·e^{σu} du for complex p, q, σ: the one integral every segment kind reduces to.
 * Near σL = 0 the closed form cancels badly, so there the power series is summed instead.
 * Closed form: ∫e^{σu} = (e^{σL} − 1)/σ; ∫u·e^{σu} = L·e^{σL}/σ − (e^{σL} − 1)/σ².
 */
function kernel(pRe: number, pIm: number, qRe: number, qIm: number, sRe: number, sIm: number, L: number): [number, number] {
  const zRe = sRe * L;
  const zIm = sIm * L;
  let k0Re: number, k0Im: number, k1Re: number, k1Im: number;
  if (zRe * zRe + zIm * zIm <= 1) {
    // Σ z^k/(k+1)!  and  Σ z^k/(k!(k+2)); 24 terms leave < 1e-23 for |z| <= 1.
    let tRe = 1, tIm = 0; // z^k / k!
    let s0Re = 0, s0Im = 0, s1Re = 0, s1Im = 0;
    for (let k = 0; k < 24; k++) {
      s0Re += tRe / (k + 1); s0Im += tIm / (k + 1);
      s1Re += tRe / (k + 2); s1Im += tIm / (k + 2);
      const nRe = (tRe * zRe - tIm * zIm) / (k + 1);
      const nIm = (tRe * zIm + tIm * zRe) / (k + 1);
      tRe = nRe; tIm = nIm;
    }
    k0Re = L * s0Re; k0Im = L * s0Im;
    k1Re = L * L * s1Re; k1Im = L * L * s1Im;
  } else {
    const m = Math.exp(zRe);
    const eRe = m * Math.cos(zIm) - 1; // e^{z} − 1
    const eIm = m * Math.sin(zIm);
    const d = sRe * sRe + sIm * sIm;
    // (e^z − 1)/σ
    k0Re = (eRe * sRe + eIm * sIm) / d;
    k0Im = (eIm * sRe - eRe * sIm) / d;
    // L·e^z/σ − k0/σ = (L·e^z − k0)/σ
    const aRe = L * (eRe + 1) - k0Re;
    const aIm = L * eIm - k0Im;
    k1Re = (aRe * sRe + aIm * sIm) / d;
    k1Im = (aIm * sRe - aRe * sIm) / d;
  }
  return [pRe * k0Re - pIm * k0Im + qRe * k1Re - qIm * k1Im, pRe * k0Im + pIm * k0Re + qRe * k1Im + qIm * k1Re];
}

/** c_n of one segment, integrated in closed form: ∫ f(θ) e^{−j2πnθ} dθ over the segment. */
function segmentCoefficient(s: Segment, n: number): [number, number] {
  const a = s.startFraction;
  const L = s.endFraction - s.startFraction;
  const w = -2 * Math.PI * n; // e^{−j2πnθ} = e^{jwθ}
  let re: number, im: number;
  switch (s.kind) {
    case 'constant': [re, im] = kernel(s.value, 0, 0, 0, 0, w, L); break;
    case 'linear': [re, im] = kernel(s.startValue, 0, (s.endValue - s.startValue) / L, 0, 0, w, L); break;
    case 'exponential': [re, im] = kernel(s.startValue, 0, 0, 0, -s.decayPerPeriod, w, L); break;
    case 'cosine': {
      // A·cos(2πmθ + φ) = (A/2)e^{j(2πmθ+φ)} + (A/2)e^{−j(2πmθ+φ)}, with θ = a + u.
      const m2 = 2 * Math.PI * s.cyclesPerPeriod;
      const half = s.amplitude / 2;
      const ph = m2 * a + s.phaseRad;
      const [r1, i1] = kernel(half * Math.cos(ph), half * Math.sin(ph), 0, 0, 0, m2 + w, L);
      const [r2, i2] = kernel(half * Math.cos(ph), -half * Math.sin(ph), 0, 0, 0, -m2 + w, L);
      const [r0, i0] = kernel(s.offset ?? 0, 0, 0, 0, 0, w, L);
      re = r0 + r1 + r2; im = i0 + i1 + i2;
      break;
    }
  }
  // shift from u = θ − a back to θ: multiply by e^{−j2πna}
  const c = Math.cos(w * a);
  const sn = Math.sin(w * a);
  return [re * c - im * sn, re * sn + im * c];
}

function termFromCoefficient(harmonic: number, cRe: number, cIm: number): FourierTerm {
  return { harmonic, a: 2 * cRe, b: -2 * cIm, amplitude: 2 * Math.hypot(cRe, cIm), phaseRad: Math.atan2(cIm, cRe) };
}

/**
 * Fourier series of a piecewise excitation, every coefficient integrated over each segment in closed form.
 * Standard Fourier analysis (e.g. Oppenheim & Willsky, Signals and Systems, 2nd ed., §3.3), from memory.
 */
export function fourierSeries(segments: readonly Segment[], harmonics: number): FourierSeries {
  validateSegments(segments);
  checkHarmonics(harmonics);
  let a0 = 0;
  for (const s of segments) a0 += segmentCoefficient(s, 0)[0];
  const terms: FourierTerm[] = [];
  for (let n = 1; n <= harmonics; n++) {
    let re = 0, im = 0;
    for (const s of segments) {
      const [r, i] = segmentCoefficient(s, n);
      re += r; im += i;
    }
    terms.push(termFromCoefficient(n, re, im));
  }
  return { a0, terms };
}

/**
 * Fourier series of one period given as equally spaced samples (θ_i = i/N), by fft.js:
 * c_n = X[n]/N (the DFT is the trapezoidal rule for the periodic integral). N must be a power of two
 * (fft.js's radix-4 kernel), and harmonics < N/2 so that no term sits on the Nyquist bin.
 */
export function sampledFourierSeries(samples: ArrayLike<number>, harmonics: number): FourierSeries {
  const N = samples?.length ?? 0;
  if (N < 2 || (N & (N - 1)) !== 0) {
    throw new SignatureInputError('invalid_samples', `samples.length (${N}) must be a power of two >= 2`);
  }
  checkHarmonics(harmonics);
  if (harmonics >= N / 2) {
    throw new SignatureInputError('invalid_harmonics', `harmonics (${harmonics}) must be below samples.length/2 (${N / 2})`);
  }
  const input = new Array<number>(N);
  for (let i = 0; i < N; i++) {
    const v = samples[i]!;
    if (!Number.isFinite(v)) throw new SignatureInputError('invalid_samples', `samples[${i}] (${v}) must be a finite number`);
    input[i] = v;
  }
  const fft = new FFT(N);
  const out = fft.createComplexArray() as number[];
  fft.realTransform(out, input);
  const terms: FourierTerm[] = [];
  for (let n = 1; n <= harmonics; n++) terms.push(termFromCoefficient(n, out[2 * n]! / N, out[2 * n + 1]! / N));
  return { a0: out[0]! / N, terms };
}

/** The complex coefficient c_n = (a_n − j b_n)/2 of a term (c_0 = a0). */
export function complexCoefficient(series: FourierSeries, harmonic: number): { re: number; im: number } {
  if (harmonic === 0) return { re: series.a0, im: 0 };
  const t = series.terms[harmonic - 1];
  if (!t) throw new SignatureInputError('invalid_harmonics', `harmonic (${harmonic}) must be from 0 to ${series.terms.length}`);
  return { re: t.a / 2, im: -t.b / 2 };
}

/** The partial sum a0 + Σ_{n=1..harmonics} A_n cos(2πnθ + φ_n) at θ. */
export function partialSum(series: FourierSeries, harmonics: number, theta: number): number {
  checkHarmonics(harmonics);
  if (harmonics > series.terms.length) {
    throw new SignatureInputError('invalid_harmonics', `harmonics (${harmonics}) must not exceed the series' ${series.terms.length} terms`);
  }
  let sum = series.a0;
  for (let n = 1; n <= harmonics; n++) {
    const t = series.terms[n - 1]!;
    sum += t.a * Math.cos(2 * Math.PI * n * theta) + t.b * Math.sin(2 * Math.PI * n * theta);
  }
  return sum;
}

export interface Waveform {
  /** θ in fractions of the period. */
  angleFraction: Float64Array;
  value: Float64Array;
}

/**
 * The partial sum for N harmonics on `points` equally spaced angles from `startFraction` over
 * `spanFraction` of a period (default one whole period, endpoint excluded): shows convergence and the
 * Gibbs overshoot at a jump. Uses the angle-addition recurrence so each point costs one cos and one sin.
 */
export function partialSumWaveform(
  series: FourierSeries,
  options: { harmonics: number; points: number; startFraction?: number; spanFraction?: number },
): Waveform {
  const { harmonics, points } = options;
  const start = options.startFraction ?? 0;
  const span = options.spanFraction ?? 1;
  checkHarmonics(harmonics);
  if (harmonics > series.terms.length) {
    throw new SignatureInputError('invalid_harmonics', `harmonics (${harmonics}) must not exceed the series' ${series.terms.length} terms`);
  }
  if (!Number.isInteger(points) || points < 1 || points > 10_000_000) {
    throw new SignatureInputError('invalid_parameter', `points (${points}) must be a whole number from 1 to 10000000`);
  }
  if (!Number.isFinite(start) || !(span > 0) || !Number.isFinite(span)) {
    throw new SignatureInputError('invalid_parameter', `startFraction (${start}) must be finite and spanFraction (${span}) a finite number > 0`);
  }
  const angleFraction = new Float64Array(points);
  const value = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const theta = start + (span * i) / points;
    angleFraction[i] = theta;
    const c1 = Math.cos(2 * Math.PI * theta);
    const s1 = Math.sin(2 * Math.PI * theta);
    let cn = 1, sn = 0; // cos(2πnθ), sin(2πnθ) for n = 0
    let sum = series.a0;
    for (let n = 1; n <= harmonics; n++) {
      const c = cn * c1 - sn * s1;
      sn = sn * c1 + cn * s1;
      cn = c;
      const t = series.terms[n - 1]!;
      sum += t.a * cn + t.b * sn;
    }
    value[i] = sum;
  }
  return { angleFraction, value };
}

/** ∫ f² over one period, in closed form per segment, for segments that do not overlap (Parseval checks). */
export function meanSquare(segments: readonly Segment[]): number {
  validateSegments(segments);
  let total = 0;
  for (const s of segments) {
    const L = s.endFraction - s.startFraction;
    switch (s.kind) {
      case 'constant': total += s.value * s.value * L; break;
      case 'linear': {
        const p = s.startValue;
        const q = (s.endValue - s.startValue) / L;
        total += L * (p * p + p * q * L + (q * q * L * L) / 3);
        break;
      }
      case 'exponential': {
        const l2 = 2 * s.decayPerPeriod;
        total += s.startValue * s.startValue * (Math.abs(l2 * L) < 1e-12 ? L : -Math.expm1(-l2 * L) / l2);
        break;
      }
      case 'cosine': {
        const o = s.offset ?? 0;
        const A = s.amplitude;
        const m = 2 * Math.PI * s.cyclesPerPeriod;
        const b = s.endFraction;
        const a = s.startFraction;
        const intCos = m === 0 ? L * Math.cos(s.phaseRad) : (Math.sin(m * b + s.phaseRad) - Math.sin(m * a + s.phaseRad)) / m;
        const intCos2 = m === 0
          ? L * Math.cos(s.phaseRad) ** 2
          : L / 2 + (Math.sin(2 * (m * b + s.phaseRad)) - Math.sin(2 * (m * a + s.phaseRad))) / (4 * m);
        total += o * o * L + 2 * o * A * intCos + A * A * intCos2;
        break;
      }
    }
  }
  return total;
}

/** Mean square of the partial sum with every term of the series: a0² + Σ A_n²/2 (Parseval). */
export function seriesMeanSquare(series: FourierSeries): number {
  return series.a0 * series.a0 + series.terms.reduce((acc, t) => acc + (t.amplitude * t.amplitude) / 2, 0);
}
