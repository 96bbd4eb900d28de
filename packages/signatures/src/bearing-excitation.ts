import { SignatureInputError } from './errors.js';
import { checkFraction, checkPositive, checkWhole, fmt, seriesLines, type Excitation } from './excitation.js';
import { fourierSeries, sampledFourierSeries, type FourierSeries, type Segment } from './fourier-series.js';
import { modulatedLines } from './line-modulation.js';

/*
 * Rolling-bearing defect excitations for the ENVELOPE spectrum. A local defect makes a train of impacts;
 * each rings the structure's high-frequency resonances, and the envelope (demodulation) of that band is what
 * repeats at the defect rate. So these templates model the envelope of the impact train: a short pulse per
 * impact (rectangular, triangular, or the exponential decay e^{−ζω_r t} of a resonance it rings), at the
 * defect rate, modulated where the defect moves through the load zone (Randall & Antoni, MSSP 25:485-520,
 * 2011, §2 (from memory); McFadden & Smith, J. Sound Vib. 96:69-82, 1984 (from memory)).
 * Orders are orders of the bearing's shaft (inner ring turning, outer ring fixed).
 */

export const impactShapes = ['rectangular', 'triangular', 'exponential'] as const;
export type ImpactShape = (typeof impactShapes)[number];

export interface ImpactOptions {
  /** Pulse shape of one impact's envelope (default: exponential if a resonance is given, else rectangular). */
  shape?: ImpactShape;
  /** Pulse length as a fraction of the defect period, for rectangular and triangular pulses (default 0.05). */
  widthFraction?: number;
  /** For exponential pulses: the resonance the impacts ring (Hz) and its damping ratio. */
  resonance?: { frequencyHz: number; dampingRatio: number };
  /** For exponential pulses without a resonance: decay rate per defect period (default 20). */
  decayPerPeriod?: number;
}

export interface BearingDefectOrders {
  bpfo: number;
  bpfi: number;
  /** Ball spin frequency (once per element revolution). */
  bsf: number;
  ftf: number;
}

export interface BearingExcitationOptions {
  /** Defect orders of the bearing (multiples of its shaft speed). */
  orders: BearingDefectOrders;
  /** Harmonics of the defect rate kept (default 5). */
  harmonics?: number;
  /** Sidebands each side of every harmonic for modulated defects (default 3). */
  sidebands?: number;
  impact?: ImpactOptions;
  /** Exponent n of the load distribution q(ψ) = cosⁿψ over the loaded half (default 1.5, ball bearings). */
  loadZoneExponent?: number;
  /** The shaft speed in Hz: needed only to turn a resonance's decay into a decay per defect period. */
  shaftSpeedHz?: number;
}

/**
 * One impact per period, as segments. Periodic overlap is exact for the exponential: the tails of all the
 * earlier impacts sum to e^{−λθ}/(1 − e^{−λ}) on [0, 1), so its coefficients are 1/(λ + j2πn), the
 * transform of a single decaying pulse (Poisson summation).
 */
export function impactSegments(shape: ImpactShape, widthFraction: number, decayPerPeriod: number): Segment[] {
  switch (shape) {
    case 'rectangular':
      return [{ kind: 'constant', startFraction: 0, endFraction: widthFraction, value: 1 }];
    case 'triangular':
      return [
        { kind: 'linear', startFraction: 0, endFraction: widthFraction / 2, startValue: 0, endValue: 1 },
        { kind: 'linear', startFraction: widthFraction / 2, endFraction: widthFraction, startValue: 1, endValue: 0 },
      ];
    case 'exponential':
      return [{ kind: 'exponential', startFraction: 0, endFraction: 1, startValue: 1 / -Math.expm1(-decayPerPeriod), decayPerPeriod }];
  }
}

function resolveImpact(impact: ImpactOptions | undefined, defectOrder: number, shaftSpeedHz: number | undefined) {
  const shape = impact?.shape ?? (impact?.resonance ? 'exponential' : 'rectangular');
  if (!impactShapes.includes(shape)) {
    throw new SignatureInputError('invalid_parameter', `impact.shape (${String(shape)}) must be one of ${impactShapes.map((s) => `'${s}'`).join(', ')}`);
  }
  const widthFraction = impact?.widthFraction ?? 0.05;
  checkFraction('impact.widthFraction', widthFraction, { minOpen: true });
  let decayPerPeriod = impact?.decayPerPeriod ?? 20;
  let note = '';
  if (shape === 'exponential' && impact?.resonance) {
    const { frequencyHz, dampingRatio } = impact.resonance;
    checkPositive('impact.resonance.frequencyHz', frequencyHz);
    checkFraction('impact.resonance.dampingRatio', dampingRatio, { minOpen: true });
    if (shaftSpeedHz === undefined) {
      throw new SignatureInputError('invalid_parameter', 'shaftSpeedHz is required to turn impact.resonance into a decay per defect period');
    }
    checkPositive('shaftSpeedHz', shaftSpeedHz);
    // envelope of a ringing SDOF: e^{−ζω_r t}; one defect period lasts 1/(order·f_shaft)
    decayPerPeriod = (dampingRatio * 2 * Math.PI * frequencyHz) / (defectOrder * shaftSpeedHz);
    note = ` (ringing ${fmt(frequencyHz)} Hz at ζ = ${fmt(dampingRatio)})`;
  }
  checkPositive('impact.decayPerPeriod', decayPerPeriod);
  const describe = shape === 'exponential' ? `exponential pulses, decay λ = ${fmt(decayPerPeriod)} per period${note}` : `${shape} pulses of ${fmt(widthFraction)} period`;
  return { segments: impactSegments(shape, widthFraction, decayPerPeriod), describe };
}

/**
 * The load zone seen by a point turning with the shaft (or the cage) under a fixed radial load: Stribeck's
 * distribution with ε = 0.5, q(ψ) = cosⁿψ for |ψ| < 90°, 0 elsewhere; n = 3/2 for ball, 10/9 for roller
 * bearings (Harris & Kotzalas, Rolling Bearing Analysis, 5th ed., §7, from memory). n = 1 is integrated in
 * closed form; other exponents from 65536 samples through fft.js (the waveform is continuous with a
 * |ψ ∓ 90°|ⁿ corner, so c_m falls as m^−(n+1) and the aliasing error is of order N^−(n+1), below 1e-9 here).
 */
export function loadZoneSeries(exponent: number, harmonics: number): FourierSeries {
  checkPositive('loadZoneExponent', exponent);
  checkWhole('harmonics', harmonics, 0, 10_000);
  // the sampled series costs a 65536-point FFT; a handful of exponents recur, so keep them (pure, frozen)
  const key = `${exponent}:${harmonics}`;
  const hit = loadZoneCache.get(key);
  if (hit) return hit;
  const series = Object.freeze(computeLoadZone(exponent, harmonics));
  if (loadZoneCache.size >= 32) loadZoneCache.delete(loadZoneCache.keys().next().value!);
  loadZoneCache.set(key, series);
  return series;
}

const loadZoneCache = new Map<string, FourierSeries>();

function computeLoadZone(exponent: number, harmonics: number): FourierSeries {
  if (exponent === 1) {
    return fourierSeries([{ kind: 'cosine', startFraction: -0.25, endFraction: 0.25, amplitude: 1, cyclesPerPeriod: 1, phaseRad: 0 }], harmonics);
  }
  const N = 65536;
  const x = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    const c = Math.cos((2 * Math.PI * i) / N);
    x[i] = c > 0 ? c ** exponent : 0;
  }
  return sampledFourierSeries(x, harmonics);
}

function common(options: BearingExcitationOptions) {
  const o = options.orders;
  for (const key of ['bpfo', 'bpfi', 'bsf', 'ftf'] as const) checkPositive(`orders.${key}`, o?.[key]);
  const K = options.harmonics ?? 5;
  const M = options.sidebands ?? 3;
  checkWhole('harmonics', K, 1, 10_000);
  checkWhole('sidebands', M, 0, 1_000);
  const n = options.loadZoneExponent ?? 1.5;
  checkPositive('loadZoneExponent', n);
  return { o, K, M, n };
}

function impactTrain(options: BearingExcitationOptions, defectOrder: number, K: number) {
  const impact = resolveImpact(options.impact, defectOrder, options.shaftSpeedHz);
  const series = fourierSeries(impact.segments, K);
  return { ...impact, series };
}

function envelopeExcitation(template: string, formula: string, fundamentalOrder: number, modulationOrder: number | null,
  train: ReturnType<typeof impactTrain>, lines: Excitation['lines']): Excitation {
  return {
    template, reference: 'impact envelope height', path: 'lateral', domain: 'envelope', fundamentalOrder, modulationOrder,
    mean: train.series.a0, lines, formula, segments: train.segments, series: train.series,
  };
}

/** Outer race (fixed, in the load zone): impacts at BPFO, lines at k·BPFO with no modulation. */
export function outerRaceExcitation(options: BearingExcitationOptions): Excitation {
  const { o, K } = common(options);
  const train = impactTrain(options, o.bpfo, K);
  return envelopeExcitation('outer-race-impacts', `impacts at BPFO = ${fmt(o.bpfo)}×, ${train.describe}: lines k·BPFO`, o.bpfo, null, train,
    seriesLines(train.series, o.bpfo, (k) => `${k}×BPFO: A = 2|c_k| of the pulse train`));
}

/**
 * Inner race (turning with the shaft, in and out of the load zone): impacts at BPFI times the load
 * distribution at shaft speed, lines k·BPFI ± m·1× (c = p_k·q_m), and 1×, 2×… from the load zone itself.
 */
export function innerRaceExcitation(options: BearingExcitationOptions): Excitation {
  const { o, K, M, n } = common(options);
  const train = impactTrain(options, o.bpfi, K);
  const zone = loadZoneSeries(n, Math.max(M, 1));
  const lines = modulatedLines(train.series, o.bpfi, { ...zone, terms: zone.terms.slice(0, M) }, 1, (k, m) =>
    k === 0 ? `${m}× shaft from the load zone: A = 2|p_0·q_${m}|` : `${k}×BPFI${m === 0 ? '' : ` ${m > 0 ? '+' : '−'} ${Math.abs(m)}× shaft`}: A = 2|p_k·q_m|`);
  return envelopeExcitation('inner-race-impacts-load-zone',
    `impacts at BPFI = ${fmt(o.bpfi)}×, ${train.describe}, times the load zone cos^${fmt(n)}ψ at 1×: lines k·BPFI + m·1×`, o.bpfi, 1, train, lines);
}

/**
 * Rolling element: a spall strikes both races once per spin, so impacts at 2×BSF, carried through the load
 * zone by the cage: lines k·2BSF ± m·FTF.
 */
export function rollingElementExcitation(options: BearingExcitationOptions): Excitation {
  const { o, K, M, n } = common(options);
  const rate = 2 * o.bsf;
  const train = impactTrain(options, rate, K);
  const zone = loadZoneSeries(n, Math.max(M, 1));
  const lines = modulatedLines(train.series, rate, { ...zone, terms: zone.terms.slice(0, M) }, o.ftf, (k, m) =>
    k === 0 ? `${m}×FTF from the load zone: A = 2|p_0·q_${m}|` : `${2 * k}×BSF${m === 0 ? '' : ` ${m > 0 ? '+' : '−'} ${Math.abs(m)}×FTF`}: A = 2|p_k·q_m|`);
  return envelopeExcitation('rolling-element-impacts-cage-modulation',
    `impacts at 2×BSF = ${fmt(rate)}×, ${train.describe}, times the load zone cos^${fmt(n)}ψ at FTF = ${fmt(o.ftf)}×: lines k·2BSF + m·FTF`, rate, o.ftf, train, lines);
}

/** Cage: one disturbance per cage revolution, lines at k·FTF. */
export function cageExcitation(options: BearingExcitationOptions): Excitation {
  const { o, K } = common(options);
  const train = impactTrain({ ...options, impact: { widthFraction: 0.2, ...options.impact } }, o.ftf, K);
  return envelopeExcitation('cage-modulation', `one disturbance per cage turn at FTF = ${fmt(o.ftf)}×, ${train.describe}: lines k·FTF`, o.ftf, null, train,
    seriesLines(train.series, o.ftf, (k) => `${k}×FTF: A = 2|c_k| of the pulse train`));
}
