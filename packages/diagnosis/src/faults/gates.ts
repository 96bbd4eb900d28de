import type { Candidate } from '../candidates.js';
import type { GateName } from './fault-descriptor.js';

/** A line as the gates read it: found or not, where, how strong, and its harmonic of the candidate's shaft. */
export interface GateLine {
  matched: boolean;
  counted: boolean;
  measuredHz: number | null;
  measuredAmplitude: number | null;
  /** The line's frequency over its shaft's rate (1 for 1×, 0.5 for a half order); NaN when not a shaft order. */
  harmonic: number;
  /** For a line near a mesh harmonic of the candidate's gear: its order of sideband (−3 for GMF − 3×), else null. */
  sidebandOrder: number | null;
}

export interface GateContext {
  candidate: Candidate;
  lines: readonly GateLine[];
  /** Quantity of the spectrum the lines were read in (amplitude ratios become velocity ratios). */
  quantity: 'acceleration' | 'velocity' | 'displacement';
  /** Where the running speed came from, and the running lines that placed it when the spectrum did. */
  /** A baseline of the point judged this hypothesis's level (an earlier analysis holding it, or healthy orders holding most of its matched power; level.ts judgedLevel). */
  hasBaseline: boolean;
  /** Harmonics of the gear's shaft rate found in its mesh's envelope (null when the record cannot tell). */
  oncePerTurn: () => number | null;
  speed: {
    source: 'tach' | 'encoder' | 'spectrum' | 'given' | null;
    /** Orders (of the reference shaft) of the running lines that placed the speed, when the spectrum did. */
    supportOrders: readonly number[];
    /** A speed was given and the one found agrees with it within 1 %. */
    givenAgrees: boolean;
  };
}

export interface GateResult {
  factor: number;
  /** Why the gate lowered the score, in words (when it did). */
  reason?: string;
}

/**
 * The score a gate lets through at most when its requirement is not met: under 0.5, so that the hypothesis is not
 * shown, but not 0, so that its evidence is still listed (and trends) for an engineer to read.
 */
export const GATE_CLOSED_FACTOR = 0.4;

/** Sidebands of order ≥ 3 that make a family wide (see 'wide-sidebands'). */
const WIDE_SIDEBANDS = 4;

/** Each gate of a fault descriptor: a requirement that the chance of the lines alone cannot express. */
export const gates: Readonly<Record<GateName, (context: GateContext) => GateResult>> = {
  /**
   * One line is never a fault: a line alone can come from anything at that frequency, and nothing in the pattern
   * says it belongs to this fault. Two independent lines of the pattern (counted: neither running lines of a fault
   * that does not own them nor lines of another component) must be found.
   */
  'more-than-one-line': ({ lines }) => {
    const found = lines.filter((l) => l.counted && l.matched).length;
    return found >= 2 ? { factor: 1 } : { factor: GATE_CLOSED_FACTOR, reason: found === 1 ? 'only one of its lines was found' : 'none of its lines was found' };
  },

  /**
   * Unbalance is a dominant 1×, so its own line is all it has: that line must be known to be the shaft's 1×, which it
   * is when the speed came from a tach or encoder, from a given speed it agrees with, or from the spectrum through
   * other running lines too (another harmonic, another shaft, a mesh or blade pass). A lone sine placed the speed on
   * itself and would be "1×" at any frequency of the speed range.
   */
  'speed-beyond-this-line': ({ candidate, speed }) => {
    if (speed.source === 'tach' || speed.source === 'encoder' || speed.givenAgrees) return { factor: 1 };
    const others = speed.supportOrders.filter((o) => Math.abs(o - candidate.shaftRatio) > 1e-6 * candidate.shaftRatio);
    return others.length > 0 ? { factor: 1 } : { factor: GATE_CLOSED_FACTOR, reason: 'the running speed rests on this one line, so it cannot be told to be 1×' };
  },

  /**
   * Misalignment needs twice running speed beside 1×: 2× at least half of 1× in velocity counts fully, a quarter or less
   * counts nothing (common practice: 2× over 50 % of 1× points to misalignment, from memory).
   */
  'twice-running-speed': ({ lines, quantity }) => {
    const one = strongestAt(lines, 1);
    const two = strongestAt(lines, 2);
    if (!two) return { factor: 0, reason: 'no line at twice running speed' };
    if (!one) return { factor: 1 };
    // Velocity ratio from the spectrum's quantity: v ∝ a/f, v ∝ x·f.
    const ratio = (two / one) * (quantity === 'acceleration' ? 0.5 : quantity === 'displacement' ? 2 : 1);
    const factor = clamp01((ratio - 0.25) / 0.25);
    return factor >= 1 ? { factor } : { factor, reason: `2× is only ${(100 * ratio).toFixed(0)} % of 1× in velocity` };
  },

  /**
   * Looseness rattles: many harmonics of running speed (3× and up) or half orders. Three such lines found count
   * fully, one or none count nothing (common practice: a harmonic series up to 10× and half orders, from memory).
   */
  'many-harmonics': ({ lines }) => {
    const n = lines.filter((l) => l.matched && l.counted && (l.harmonic >= 2.5 || Math.abs(l.harmonic - Math.round(l.harmonic)) > 0.25)).length;
    const factor = clamp01((n - 1) / 2);
    return factor >= 1 ? { factor } : { factor, reason: `only ${n} harmonics above 2× or half orders were found` };
  },

  /** Applied after the other bearing hypotheses are scored (see hypotheses.ts): here it always passes. */
  'with-bearing-damage': () => ({ factor: 1 }),

  /**
   * Tooth wear raises the mesh harmonics 2× and 3× against 1× (common practice), but between a mesh and a sensor lies a
   * path the model does not know, which alone can put 2× over 1×: only the change against a baseline of the same point
   * says wear. Without one the level is not judged and the hypothesis is not shown.
   */
  'needs-baseline': ({ hasBaseline }) => (hasBaseline ? { factor: 1 } : { factor: GATE_CLOSED_FACTOR, reason: 'tooth wear is judged only against a baseline of this point (mesh harmonic ratios depend on the path to the sensor)' }),

  /**
   * A local tooth fault strikes once per turn of its gear: the envelope of its mesh is impulsive at the shaft rate, a
   * comb of many harmonics (Randall 2011, ch. 2 and 6: envelope and cepstrum at the faulty gear's rate, from memory),
   * where a smooth runout gives 1× and 2×. Five or more of the first eight count fully, two or fewer nothing; a record
   * that cannot tell (no band holds the mesh harmonics) leaves the score as it is.
   */
  'once-per-turn': ({ oncePerTurn }) => {
    const n = oncePerTurn();
    if (n === null) return { factor: 1 };
    const factor = clamp01((n - 2) / 3);
    return factor >= 1 ? { factor } : { factor, reason: `the envelope of its mesh shows only ${n} of 8 harmonics of its shaft rate (a local tooth fault strikes once per turn)` };
  },

  /**
   * A local tooth fault (a missing, broken or cracked tooth) acts for one tooth's mesh per turn: a short event whose
   * spectrum spreads over about half the tooth count in orders, so sidebands of the gear's shaft rate stand far out on
   * both sides of each mesh harmonic. Runout and eccentricity, one cycle per turn, give only ±1× and ±2× (Randall,
   * Vibration-based Condition Monitoring, 2011, ch. 2: local versus distributed faults, from memory). At least
   * WIDE_SIDEBANDS found sidebands of order 3 or more count fully, one or none count nothing.
   */
  'wide-sidebands': ({ lines }) => {
    const wide = lines.filter((l) => l.counted && l.matched && l.sidebandOrder !== null && Math.abs(l.sidebandOrder) >= 3).length;
    const factor = clamp01((wide - 1) / (WIDE_SIDEBANDS - 1));
    return factor >= 1 ? { factor } : { factor, reason: `only ${wide} sidebands of order 3 or more around its mesh were found (a local tooth fault spreads them far; runout gives ±1×, ±2×)` };
  },
};

function strongestAt(lines: readonly GateLine[], harmonic: number): number | null {
  let best: number | null = null;
  for (const l of lines) if (l.matched && Math.abs(l.harmonic - harmonic) < 0.05 && l.measuredAmplitude !== null) best = Math.max(best ?? 0, l.measuredAmplitude);
  return best;
}

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.min(1, Math.max(0, x)) : 0;
}
