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
}

export interface GateContext {
  candidate: Candidate;
  lines: readonly GateLine[];
  /** Quantity of the spectrum the lines were read in (amplitude ratios become velocity ratios). */
  quantity: 'acceleration' | 'velocity' | 'displacement';
  /** Where the running speed came from, and the running lines that placed it when the spectrum did. */
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
};

function strongestAt(lines: readonly GateLine[], harmonic: number): number | null {
  let best: number | null = null;
  for (const l of lines) if (l.matched && Math.abs(l.harmonic - harmonic) < 0.05 && l.measuredAmplitude !== null) best = Math.max(best ?? 0, l.measuredAmplitude);
  return best;
}

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.min(1, Math.max(0, x)) : 0;
}
