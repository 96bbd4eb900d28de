import type { FourierSeries, Segment } from './fourier-series.js';
import { SignatureInputError } from './errors.js';

/**
 * One line of an excitation: where it sits and its complex coefficient.
 * The coefficient is the one-sided phasor C = A·e^{jφ} = 2·c_n, so the line contributes A·cos(2πft + φ)
 * to the excitation, in units of the template's `reference` (e.g. fractions of the mean mesh torque).
 */
export interface ExcitationLine {
  /** Position as a multiple of the template's base shaft speed; null for a line at a fixed frequency. */
  order: number | null;
  /** Position in Hz for a line that does not follow the shaft (electrical); null otherwise. */
  frequencyHz: number | null;
  /** k: the harmonic of the excitation's fundamental. */
  harmonic: number;
  /** m: the sideband index of a modulated excitation (carrier + m × modulation); 0 on a carrier. */
  sideband: number;
  coefficient: ExcitationCoefficient;
  /** How this line's coefficient follows from the template, e.g. "A_21 = 2·d·(w/Z)·|sinc(21·w/Z)|". */
  formula: string;
}

export interface ExcitationCoefficient {
  re: number;
  im: number;
  /** One-sided amplitude A = |C|. */
  amplitude: number;
  /** φ of A·cos(2πft + φ). */
  phaseRad: number;
}

export type ExcitationPath = 'torsional' | 'lateral';
export type SpectrumDomain = 'spectrum' | 'envelope';

/** A fault's periodic excitation as a line spectrum, with the model it came from. */
export interface Excitation {
  /** Template name, e.g. 'tooth-drop', 'outer-race-impacts'. */
  template: string;
  /** What the coefficients are fractions of. */
  reference: string;
  /** A torque at a gear body (through the torsional chain) or a force at a bearing (structure only). */
  path: ExcitationPath;
  /** Ordinary spectrum, or the envelope (demodulated) spectrum for bearing impacts. */
  domain: SpectrumDomain;
  /** The excitation's fundamental as an order of its base shaft (1 for a once-per-rev waveform, BPFO for an outer race), or null for fixed-frequency lines. */
  fundamentalOrder: number | null;
  /** Order of the modulation (shaft for an inner race, FTF for a rolling element), when there is one. */
  modulationOrder: number | null;
  /** The mean (0 Hz) value; not a line, since a free chain has no steady response to it. */
  mean: number;
  /** Lines with a non-zero coefficient, lowest first. */
  lines: ExcitationLine[];
  /** The model in one line, e.g. "mean mesh torque absent for 1/Z rev: c_n = −d(w/Z)sinc(nw/Z)". */
  formula: string;
  /** Over one period of the fundamental (when the template is written as segments): for waveform plots. */
  segments: Segment[] | null;
  /** The series of the (unmodulated) periodic waveform, for partial sums. */
  series: FourierSeries | null;
}

export function coefficientFromPhasor(re: number, im: number): ExcitationCoefficient {
  return { re, im, amplitude: Math.hypot(re, im), phaseRad: Math.atan2(im, re) };
}

/** Lines whose amplitude is below this fraction of the largest are dropped as zeros of the series. */
export const ZERO_LINE_FRACTION = 1e-9;

/** Lines n = 1..N of a series placed at n × fundamentalOrder, zeros of the series left out. */
export function seriesLines(series: FourierSeries, fundamentalOrder: number, formula: (n: number) => string): ExcitationLine[] {
  const peak = Math.max(0, ...series.terms.map((t) => t.amplitude));
  return series.terms
    .filter((t) => t.amplitude > ZERO_LINE_FRACTION * peak && t.amplitude > 0)
    .map((t) => ({
      order: t.harmonic * fundamentalOrder,
      frequencyHz: null,
      harmonic: t.harmonic,
      sideband: 0,
      // one-sided phasor A·e^{jφ} = a − jb
      coefficient: coefficientFromPhasor(t.a, -t.b),
      formula: formula(t.harmonic),
    }));
}

export function checkFraction(name: string, value: number, { min = 0, max = 1, minOpen = false } = {}): void {
  if (!Number.isFinite(value) || value < min || value > max || (minOpen && value === min)) {
    throw new SignatureInputError('invalid_parameter', `${name} (${value}) must be a number ${minOpen ? '>' : '>='} ${min} and <= ${max}`);
  }
}

export function checkWhole(name: string, value: number, min: number, max = 100_000): void {
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new SignatureInputError('invalid_harmonics', `${name} (${value}) must be a whole number from ${min} to ${max}`);
  }
}

export function checkPositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new SignatureInputError('invalid_parameter', `${name} (${value}) must be a finite number > 0`);
  }
}

/** Four significant figures for formula strings. */
export function fmt(x: number): string {
  if (x === 0 || !Number.isFinite(x)) return String(x);
  return Number(x.toPrecision(4)).toString();
}
