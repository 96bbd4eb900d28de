import type { BearingFaultOrders, FaultKind } from '@kinespec/kinematics';

/** Which bearing defect rate a comb is built on (orders of the bearing's shaft, @kinespec/kinematics). */
export type BearingRate = keyof BearingFaultOrders;

/**
 * How a bearing defect shows in the squared-envelope spectrum: a comb of one defect rate's harmonics, the modulation
 * sidebands that are evidence of this kind, and the modulations that belong to its pattern (Randall & Antoni,
 * "Rolling element bearing diagnostics — a tutorial", MSSP 25:485–520, 2011, §2).
 */
export interface BearingCombRule {
  rate: BearingRate;
  /** The comb's spacing is this multiple of the rate (2 for a rolling element, which meets both races each spin). */
  multiple: number;
  /** Short name of the rate in evidence labels. */
  rateLabel: string;
  /** Sidebands that are evidence (inner race: the shaft, by the load zone; rolling element: the cage). */
  sideband: 'shaft' | 'cage' | null;
  /** Modulation rates whose sidebands belong to the pattern (not counted as clutter around it). */
  modulation: ReadonlyArray<'shaft' | 'cage'>;
}

/** How the size of a fault is judged when the point has no baseline (see level.ts). */
export type LevelRule =
  /** Lines every running machine shows a little of: their r.m.s. velocity against the ISO A/B boundary. */
  | 'iso-velocity'
  /** A tooth drop's depth read from its mesh's sidebands, against the depth this kind stands for. */
  | 'tooth-drop'
  /** Mesh harmonics 2× and 3× against 1×. */
  | 'mesh-harmonics'
  /** Presence is the fault: a healthy machine shows none of its lines. */
  | 'presence';

/** A requirement beyond the chance of the lines (see gates.ts); each names why it can lower a score. */
export type GateName =
  /** Fewer than two independent lines found: one line is never a fault, it is only a line. */
  | 'more-than-one-line'
  /** Unbalance: the 1× must be a shaft's 1× — the running speed known from more than that line alone. */
  | 'speed-beyond-this-line'
  /** Misalignment: twice running speed must stand beside 1× (2× at least half of 1× in velocity). */
  | 'twice-running-speed'
  /** Looseness: many harmonics or half orders, not 1× and 2× alone. */
  | 'many-harmonics'
  /** A cage defect goes with damage of its bearing's races or rolling elements: alone, its comb is a modulation. */
  | 'with-bearing-damage'
  /** Judged only against a baseline of the same point: the path from mesh to sensor sets mesh harmonic ratios. */
  | 'needs-baseline'
  /** A local tooth fault spreads its sidebands far from each mesh harmonic, not only ±1×, ±2× (runout does that). */
  | 'wide-sidebands'
  /** A local tooth fault strikes once per turn: its mesh's envelope is a comb of its shaft rate. */
  | 'once-per-turn';

/**
 * One home for a fault kind's judging: everything the diagnosis reads of a kind beyond the vocabulary facts of
 * @kinespec/kinematics (components, family, words). Candidates, scoring, reasons and the console read it from here;
 * adding a kind is one descriptor and one excitation template in @kinespec/signatures.
 */
export interface FaultDescriptor {
  kind: FaultKind;
  /** Spectrum the kind's lines are looked for in. */
  domain: 'spectrum' | 'envelope';
  /** Lines a healthy machine shows anyway that this kind still owns (unbalance its 1×, wear its mesh harmonics). */
  ownsRunningLines: boolean;
  /**
   * How the lines are judged found. 'chance': by how unlikely the pattern is in this spectrum (a defect's lines are
   * not there on a healthy machine, so their presence is the evidence). 'presence': by standing clear of the floor
   * (lines every running machine shows — 1×, 2×, mesh harmonics — are no surprise; how big they are is the question,
   * which the level answers).
   */
  evidence: 'chance' | 'presence';
  /** Options of the prediction (@kinespec/signatures predictSignature) beyond fault, component, speed and point. */
  prediction?: { depthFraction?: number; rippleFraction?: number };
  /** The bearing comb, for envelope faults. */
  comb?: BearingCombRule;
  level: LevelRule;
  /** The cepstrum's rahmonic at the gear's shaft period supports it. */
  cepstralSupport: boolean;
  gates: readonly GateName[];
}
