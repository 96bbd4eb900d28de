import { checkFraction, checkPositive, checkWhole, coefficientFromPhasor, fmt, seriesLines, type Excitation } from './excitation.js';
import { fourierSeries } from './fourier-series.js';

/*
 * Once-per-revolution families of a shaft (lateral forces at its bearings), as fractions of the
 * fundamental's force. These are the trade's rules of thumb (common practice); the relative sizes are
 * template parameters with stated defaults, not measured laws.
 */

function fixedLines(template: string, formula: string, amplitudes: readonly number[]): Excitation {
  const lines = amplitudes
    .map((a, i) => ({ a, n: i + 1 }))
    .filter(({ a }) => a > 0)
    .map(({ a, n }) => ({
      order: n, frequencyHz: null, harmonic: n, sideband: 0, coefficient: coefficientFromPhasor(a, 0),
      formula: `${n}×: A = ${fmt(a)}`,
    }));
  return {
    template, reference: 'force of the 1× line', path: 'lateral', domain: 'spectrum', fundamentalOrder: 1,
    modulationOrder: null, mean: 0, lines, formula, segments: null, series: null,
  };
}

/** Unbalance: a rotating force U·Ω² at 1× (common practice). */
export function unbalanceExcitation(): Excitation {
  return fixedLines('rotating-force', 'rotating force F = U·Ω² at 1× only', [1]);
}

export interface MisalignmentOptions {
  /** Size of the 2× and 3× lines relative to 1× (default [1, 0.4]: common practice says 2× is often as high as 1×). */
  relativeAmplitudes?: readonly [number, number];
}

/** Misalignment: 1×, a high 2× and some 3× (common practice; the coupling's reaction repeats twice per turn). */
export function misalignmentExcitation(options: MisalignmentOptions = {}): Excitation {
  const [a2, a3] = options.relativeAmplitudes ?? [1, 0.4];
  checkFraction('relativeAmplitudes[0]', a2, { max: 100 });
  checkFraction('relativeAmplitudes[1]', a3, { max: 100 });
  return fixedLines('coupling-reaction', `coupling reaction: 1× : 2× : 3× = 1 : ${fmt(a2)} : ${fmt(a3)} (common practice)`, [1, a2, a3]);
}

export interface LoosenessOptions {
  /** Revolutions between impacts: 1 gives whole orders, 2 (default) half orders too (sub-harmonic rattle). */
  periodRevs?: number;
  /** Impact length as a fraction of the period (default 0.1). */
  widthFraction?: number;
  /** Harmonics of 1/periodRevs kept (default 10·periodRevs: up to 10×). */
  harmonics?: number;
}

/**
 * Mechanical looseness: a part that lifts and lands once every `periodRevs` revolutions makes a narrow
 * pulse train, hence many harmonics of 1× and, with periodRevs = 2, half orders (common practice). The
 * pulse is rectangular, so c_n = w·sinc(n·w)·e^{−jπnw} (Oppenheim & Willsky, Ex. 3.5, from memory).
 */
export function loosenessExcitation(options: LoosenessOptions = {}): Excitation {
  const p = options.periodRevs ?? 2;
  checkWhole('periodRevs', p, 1, 16);
  const w = options.widthFraction ?? 0.1;
  checkFraction('widthFraction', w, { minOpen: true });
  const N = options.harmonics ?? 10 * p;
  checkWhole('harmonics', N, 1, 100_000);
  checkPositive('widthFraction', w);
  const segments = [{ kind: 'constant' as const, startFraction: 0, endFraction: w, value: 1 }];
  const series = fourierSeries(segments, N);
  const peak = Math.max(...series.terms.map((t) => t.amplitude));
  // normalise so that the strongest line is 1, like the other shaft families
  const scaled = { a0: series.a0 / peak, terms: series.terms.map((t) => ({ ...t, a: t.a / peak, b: t.b / peak, amplitude: t.amplitude / peak })) };
  return {
    template: 'sub-harmonic-impacts',
    reference: 'strongest line',
    path: 'lateral',
    domain: 'spectrum',
    fundamentalOrder: 1 / p,
    modulationOrder: null,
    mean: scaled.a0,
    lines: seriesLines(scaled, 1 / p, (n) => `${fmt(n / p)}×: A ∝ |sinc(${n}·${fmt(w)})|`),
    formula: `one impact every ${p} rev, rectangular of ${fmt(w)} period: c_n = w·sinc(n·w)·e^{−jπnw}, lines at n/${p}×`,
    segments,
    series: scaled,
  };
}
