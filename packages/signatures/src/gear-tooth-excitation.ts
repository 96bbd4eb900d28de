import { SignatureInputError } from './errors.js';
import { checkFraction, checkPositive, checkWhole, fmt, seriesLines, type Excitation } from './excitation.js';
import { fourierSeries, type Segment } from './fourier-series.js';
import { modulatedLines } from './line-modulation.js';

/*
 * Tooth-mesh excitations of one gear, over one revolution of its shaft, as fractions of the mean mesh
 * torque T0. Orders are orders of the gear's own shaft; the mesh frequency is order Z.
 */

export const toothDropShapes = ['rectangular', 'half-sine', 'triangular'] as const;
export type ToothDropShape = (typeof toothDropShapes)[number];

export interface ToothDropOptions {
  /** Tooth count Z of the faulty gear. */
  teeth: number;
  /** Fraction of the mean mesh torque lost at the bottom of the drop: 1 for a missing tooth, less for a broken or chipped one. */
  depthFraction?: number;
  /** Shape of the drop; the simplest published model, and the default, is rectangular. */
  shape?: ToothDropShape;
  /** Length of the drop in tooth pitches (default 1: one tooth period). */
  widthPitches?: number;
  /** Mesh-frequency ripple r·cos(2πZθ) as a fraction of T0, the optional separate term (default 0). */
  rippleFraction?: number;
  /** Highest shaft order kept (default 3·Z: up to the third mesh harmonic). */
  harmonics?: number;
}

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

/**
 * The drop written as segments (centred on θ = 0, so its coefficients are real) and the closed form of the
 * drop's coefficients per shape, L = w/Z being the drop length in revolutions:
 *   rectangular  −d on |θ| < L/2:                     c_n = −d·L·sinc(nL)
 *   half-sine    −d·cos(πθ/L) on |θ| < L/2:            c_n = −d·(2L/π)·cos(πnL)/(1 − (2nL)²)
 *   triangular   −d·(1 − 2|θ|/L) on |θ| < L/2:         c_n = −d·(L/2)·sinc²(nL/2)
 * (Fourier transforms of the rectangular, cosine and triangular pulses: Bracewell, The Fourier Transform and
 * Its Applications, ch. 2 tables, from memory; the periodic coefficients are the transform at n.)
 */
function dropSegments(shape: ToothDropShape, L: number, d: number): Segment[] {
  const a = -L / 2, b = L / 2;
  switch (shape) {
    case 'rectangular':
      return [{ kind: 'constant', startFraction: a, endFraction: b, value: -d }];
    case 'half-sine':
      // −d·cos(πθ/L) = −d·cos(2π·θ/(2L)): 1/(2L) cycles per period, crest at θ = 0
      return [{ kind: 'cosine', startFraction: a, endFraction: b, amplitude: -d, cyclesPerPeriod: 1 / (2 * L), phaseRad: 0 }];
    case 'triangular':
      return [
        { kind: 'linear', startFraction: a, endFraction: 0, startValue: 0, endValue: -d },
        { kind: 'linear', startFraction: 0, endFraction: b, startValue: -d, endValue: 0 },
      ];
  }
}

function dropFormula(shape: ToothDropShape): string {
  switch (shape) {
    case 'rectangular': return 'c_n = −d·L·sinc(n·L)';
    case 'half-sine': return 'c_n = −d·(2L/π)·cos(π·n·L)/(1 − (2·n·L)²)';
    case 'triangular': return 'c_n = −d·(L/2)·sinc²(n·L/2)';
  }
}

/** The closed form of the drop's own coefficient c_n (real, the drop being centred on 0); exported for checks and plots. */
export function toothDropCoefficient(shape: ToothDropShape, L: number, d: number, n: number): number {
  switch (shape) {
    case 'rectangular': return -d * L * sinc(n * L);
    case 'half-sine': {
      const x = 2 * n * L;
      // removable singularity at 2nL = 1: the limit is L/2
      return Math.abs(1 - x * x) < 1e-12 ? -d * (L / 2) : (-d * (2 * L / Math.PI) * Math.cos(Math.PI * n * L)) / (1 - x * x);
    }
    case 'triangular': return -d * (L / 2) * sinc((n * L) / 2) ** 2;
  }
}

function describeOrder(n: number, Z: number): string {
  const k = Math.round(n / Z);
  const m = n - k * Z;
  if (k === 0) return `n = ${n}`;
  if (m === 0) return `n = ${n} = ${k}×Z`;
  return `n = ${n} = ${k}×Z ${m > 0 ? '+' : '−'} ${Math.abs(m)}`;
}

/**
 * A tooth-mesh torque that drops out for one tooth period per revolution (missing tooth, depth 1) or loses a
 * fraction of it (broken or chipped tooth): T(θ)/T0 = 1 − d·s(θ) + ripple, θ in revolutions of the gear.
 * By default the simplest published model, a rectangular drop of one pitch: its coefficients vanish at every
 * mesh harmonic n = kZ (sinc zeros), so the fault shows as shaft harmonics between them
 * (check-values.md §6; Randall, Vibration-based Condition Monitoring, 2011, ch. 2, from memory).
 * The optional ripple r·cos(2πZθ) is gated off by (1 − d) over the drop window whatever its shape.
 */
export function toothDropExcitation(options: ToothDropOptions): Excitation {
  const Z = options.teeth;
  checkWhole('teeth', Z, 1, 100_000);
  const d = options.depthFraction ?? 1;
  checkFraction('depthFraction', d, { minOpen: true });
  const shape = options.shape ?? 'rectangular';
  if (!toothDropShapes.includes(shape)) {
    throw new SignatureInputError('invalid_parameter', `shape (${String(shape)}) must be one of ${toothDropShapes.map((s) => `'${s}'`).join(', ')}`);
  }
  const w = options.widthPitches ?? 1;
  checkPositive('widthPitches', w);
  if (w > Z) throw new SignatureInputError('invalid_parameter', `widthPitches (${w}) must not exceed the tooth count (${Z})`);
  const r = options.rippleFraction ?? 0;
  checkFraction('rippleFraction', r, { max: 10 });
  const N = options.harmonics ?? 3 * Z;
  checkWhole('harmonics', N, 1, 1_000_000);

  const L = w / Z;
  const origin = -L / 2;
  const segments: Segment[] = [
    { kind: 'constant', startFraction: origin, endFraction: origin + 1, value: 1 },
    ...dropSegments(shape, L, d),
  ];
  if (r > 0) {
    segments.push({ kind: 'cosine', startFraction: origin, endFraction: origin + 1, amplitude: r, cyclesPerPeriod: Z, phaseRad: 0 });
    segments.push({ kind: 'cosine', startFraction: -L / 2, endFraction: L / 2, amplitude: -d * r, cyclesPerPeriod: Z, phaseRad: 0 });
  }
  const series = fourierSeries(segments, N);
  const drop = dropFormula(shape);
  const formula = `T/T0 = 1 − d·s(θ)${r > 0 ? ' + r·cos(2πZθ)·(1 − d on the drop)' : ''}; Z = ${Z}, d = ${fmt(d)}, L = w/Z = ${fmt(L)} rev (${shape}); ${drop}${r > 0 ? ' plus the gated ripple' : ''}`;
  return {
    template: 'tooth-drop',
    reference: 'mean mesh torque T0',
    path: 'torsional',
    domain: 'spectrum',
    fundamentalOrder: 1,
    modulationOrder: null,
    mean: series.a0,
    lines: seriesLines(series, 1, (n) => `${describeOrder(n, Z)}: A_n = 2|c_n|, ${drop}${r > 0 && n % Z === 0 ? ' + ripple' : ''}`),
    formula,
    segments,
    series,
  };
}

export interface GearEccentricityOptions {
  teeth: number;
  /** Depth of the once-per-revolution modulation e of the mesh torque (default 0.2). */
  modulationFraction?: number;
  /** Mesh-frequency ripple r as a fraction of T0 (default 0.1). */
  rippleFraction?: number;
}

/**
 * An eccentric (or run-out) gear: the mesh is amplitude modulated at its shaft speed,
 * T/T0 = (1 + e·cos 2πθ)·(1 + r·cos 2πZθ): a 1× line (e), the mesh line (r) and the sidebands
 * Z ± 1 (e·r/2 each) (amplitude modulation, e.g. Randall 2011 ch. 2; common practice).
 */
export function gearEccentricityExcitation(options: GearEccentricityOptions): Excitation {
  const Z = options.teeth;
  checkWhole('teeth', Z, 2, 100_000);
  const e = options.modulationFraction ?? 0.2;
  const r = options.rippleFraction ?? 0.1;
  checkFraction('modulationFraction', e);
  checkFraction('rippleFraction', r, { max: 10 });
  // carrier: one tooth period as its own period (order Z); modulator: one revolution (order 1)
  const carrier = fourierSeries([{ kind: 'cosine', startFraction: 0, endFraction: 1, amplitude: r, cyclesPerPeriod: 1, phaseRad: 0, offset: 1 }], 1);
  const modulator = fourierSeries([{ kind: 'cosine', startFraction: 0, endFraction: 1, amplitude: e, cyclesPerPeriod: 1, phaseRad: 0, offset: 1 }], 1);
  const lines = modulatedLines(carrier, Z, modulator, 1, (k, m) =>
    k === 0 ? `1× from the modulation: A = e` : m === 0 ? `mesh (Z = ${Z}): A = r` : `mesh ${m > 0 ? '+' : '−'} 1×: A = e·r/2`);
  return {
    template: 'mesh-amplitude-modulation',
    reference: 'mean mesh torque T0',
    path: 'torsional',
    domain: 'spectrum',
    fundamentalOrder: Z,
    modulationOrder: 1,
    mean: 1,
    lines,
    formula: `T/T0 = (1 + e·cos 2πθ)(1 + r·cos 2πZθ); Z = ${Z}, e = ${fmt(e)}, r = ${fmt(r)}: A_1 = e, A_Z = r, A_Z±1 = e·r/2`,
    segments: null,
    series: null,
  };
}

export interface GearWearOptions {
  /** Tooth count of the gear whose shaft the orders refer to. */
  teeth: number;
  /** Mesh-frequency ripple r as a fraction of T0 (default 0.1). */
  rippleFraction?: number;
  /** Growth of the 2nd and 3rd mesh harmonics relative to the 1st (default 0.5 each). */
  wearFraction?: number;
}

/**
 * Distributed wear: every tooth's profile departs from the involute alike, so the per-pitch mesh waveform
 * gains 2nd and 3rd harmonics: r·[cos 2πZθ + w·cos 4πZθ + w·cos 6πZθ] (common practice: wear shows as
 * growth of 2× and 3× mesh frequency; the relative size w is a template parameter, not a measured law).
 */
export function gearWearExcitation(options: GearWearOptions): Excitation {
  const Z = options.teeth;
  checkWhole('teeth', Z, 1, 100_000);
  const r = options.rippleFraction ?? 0.1;
  const w = options.wearFraction ?? 0.5;
  checkFraction('rippleFraction', r, { max: 10, minOpen: true });
  checkFraction('wearFraction', w, { max: 10 });
  const segments: Segment[] = [1, 2, 3].map((k) => ({
    kind: 'cosine', startFraction: 0, endFraction: 1, amplitude: k === 1 ? r : r * w, cyclesPerPeriod: k * Z, phaseRad: 0,
  }));
  const series = fourierSeries(segments, 3 * Z);
  return {
    template: 'mesh-harmonic-growth',
    reference: 'mean mesh torque T0',
    path: 'torsional',
    domain: 'spectrum',
    fundamentalOrder: 1,
    modulationOrder: null,
    mean: 0,
    lines: seriesLines(series, 1, (n) => (n === Z ? 'GMF: A = r' : `${n / Z}×GMF: A = r·w`)),
    formula: `per-pitch waveform r·[cos 2πZθ + w·cos 4πZθ + w·cos 6πZθ]; Z = ${Z}, r = ${fmt(r)}, w = ${fmt(w)}`,
    segments,
    series,
  };
}
