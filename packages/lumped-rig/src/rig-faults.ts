/**
 * The faults the rig builds, named as Kinespec names them (the vocabulary of @kinespec/kinematics' fault kinds;
 * a test checks every name against it), and the physical size each severity stands for.
 */
export const rigFaultKinds = [
  'unbalance',
  'misalignment',
  'looseness',
  'gear-missing-tooth',
  'gear-broken-tooth',
  'gear-wear',
  'gear-eccentricity',
  'bearing-outer-race',
  'bearing-inner-race',
  'bearing-rolling-element',
] as const;

export type RigFaultKind = (typeof rigFaultKinds)[number];

/** 'shallow': early, near the edge of what a trained analyst would call; 'clear': well developed. */
export type RigSeverity = 'shallow' | 'clear';

export interface RigFault {
  fault: RigFaultKind;
  /** A component id of the machine model: gear, gear mesh (wear), bearing, shaft, or rotor (unbalance). */
  component: string;
  severity: RigSeverity;
}

/** The physical size a fault was built with, for the label. */
export interface FaultSize {
  quantity: string;
  value: number;
  unit: string;
}

/**
 * Ranges of each fault's physical size per severity (drawn uniformly). Reasons:
 * - unbalance: ISO 21940-11 grade G (mm/s) at the highest speed; healthy machines are drawn at G1-G2.5 (better than the
 *   G6.3 a fan may be sold at), shallow G8-G16, clear G25-G60 (from memory of the grade table's steps);
 * - misalignment: parallel offset at the coupling; typical tolerances for 1500 rpm are about 0.1 mm (common practice,
 *   from memory), so 0.12-0.25 mm is a shallow and 0.4-0.8 mm a clear fault; healthy machines keep 0.005-0.02 mm;
 * - looseness: the clearance of the loose hold-down; what still holds it is drawn against the running force (shallow:
 *   0.6-0.85 of the 1× force, brief lift-offs; clear: 0.15-0.45, long flights);
 * - gear-missing-tooth: the stiffness a broken-off tooth keeps (shallow: a stump over part of the face, 0.2-0.4;
 *   clear: gone, 0);
 * - gear-broken-tooth (a cracked tooth): the fraction of its pair stiffness lost (shallow 0.15-0.3, clear 0.4-0.7; a
 *   deep root crack halves a tooth's stiffness, e.g. Chaari, Fakhfakh & Haddar 2009, Eur. J. Mech. A/Solids
 *   28:461-468; from memory);
 * - gear-wear: wear depth at tip and root (µm) against a healthy 0;
 * - gear-eccentricity: the gear's eccentricity (µm) against a healthy 3-10 µm (ISO 1328 runout tolerances of
 *   10-30 µm at these sizes, from memory);
 * - bearing faults: spall length along the rolling direction (mm); shallow 0.1-0.3 mm is the size of the smallest
 *   seeded faults of public bearing test rigs (0.18 mm is common; from memory), clear 1-2.5 mm a developed spall.
 */
export const FAULT_SIZE_RANGES: Record<RigFaultKind, { quantity: string; unit: string; shallow: [number, number]; clear: [number, number] }> = {
  'unbalance': { quantity: 'balance grade', unit: 'mm/s', shallow: [8, 16], clear: [25, 60] },
  'misalignment': { quantity: 'parallel offset', unit: 'mm', shallow: [0.12, 0.25], clear: [0.4, 0.8] },
  'looseness': { quantity: 'hold-down clearance', unit: 'mm', shallow: [0.02, 0.05], clear: [0.08, 0.25] },
  'gear-missing-tooth': { quantity: 'stiffness kept by the tooth', unit: 'fraction', shallow: [0.2, 0.4], clear: [0, 0] },
  'gear-broken-tooth': { quantity: 'tooth stiffness lost', unit: 'fraction', shallow: [0.15, 0.3], clear: [0.4, 0.7] },
  'gear-wear': { quantity: 'wear depth at tip and root', unit: 'um', shallow: [4, 8], clear: [12, 25] },
  'gear-eccentricity': { quantity: 'eccentricity', unit: 'um', shallow: [25, 40], clear: [60, 120] },
  'bearing-outer-race': { quantity: 'spall length', unit: 'mm', shallow: [0.1, 0.3], clear: [1.0, 2.5] },
  'bearing-inner-race': { quantity: 'spall length', unit: 'mm', shallow: [0.1, 0.3], clear: [1.0, 2.5] },
  'bearing-rolling-element': { quantity: 'spall length', unit: 'mm', shallow: [0.1, 0.3], clear: [1.0, 2.5] },
};

/** Held-down fraction of the 1× force for looseness, per severity (see FAULT_SIZE_RANGES). */
export const LOOSENESS_HOLDING_FRACTION: Record<RigSeverity, [number, number]> = { shallow: [0.6, 0.85], clear: [0.15, 0.45] };

export function isBearingFault(kind: RigFaultKind): kind is 'bearing-outer-race' | 'bearing-inner-race' | 'bearing-rolling-element' {
  return kind === 'bearing-outer-race' || kind === 'bearing-inner-race' || kind === 'bearing-rolling-element';
}
