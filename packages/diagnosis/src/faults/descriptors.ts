import type { FaultKind } from '@kinespec/kinematics';
import type { FaultDescriptor } from './fault-descriptor.js';

/**
 * Depth of the mesh-torque drop each tooth fault stands for: all of it while a missing tooth should be in mesh,
 * half of it for a broken or chipped tooth (the defaults of @kinespec/signatures; the tooth-drop level compares the
 * measured depth with them).
 */
export const TOOTH_DROP_DEPTH = { 'gear-missing-tooth': 1, 'gear-broken-tooth': 0.5 } as const;

/**
 * Mesh-frequency ripple (transmission error) assumed under a tooth fault, as a fraction of the mean mesh torque:
 * every real mesh has one, and the fault's sidebands around the mesh frequency are its modulation (common practice;
 * Randall, Vibration-based Condition Monitoring, 2011, ch. 2, from memory). 0.1 is the ripple @kinespec/signatures
 * assumes for its eccentricity and wear templates; without it the prediction holds only the comb of the drop itself.
 */
export const MESH_RIPPLE_FRACTION = 0.1;

/** Every fault kind's descriptor: the compiler asks for one per kind of the vocabulary. */
export const faultDescriptors: Readonly<Record<FaultKind, FaultDescriptor>> = {
  'unbalance': {
    kind: 'unbalance', domain: 'spectrum', ownsRunningLines: true, evidence: 'presence', level: 'iso-velocity', cepstralSupport: false,
    gates: ['speed-beyond-this-line'],
  },
  'misalignment': {
    kind: 'misalignment', domain: 'spectrum', ownsRunningLines: true, evidence: 'presence', level: 'iso-velocity', cepstralSupport: false,
    gates: ['more-than-one-line', 'twice-running-speed'],
  },
  'looseness': {
    kind: 'looseness', domain: 'spectrum', ownsRunningLines: true, evidence: 'presence', level: 'iso-velocity', cepstralSupport: false,
    gates: ['more-than-one-line', 'many-harmonics'],
  },
  'gear-missing-tooth': {
    kind: 'gear-missing-tooth', domain: 'spectrum', ownsRunningLines: false, evidence: 'chance', level: 'tooth-drop', cepstralSupport: true,
    prediction: { depthFraction: TOOTH_DROP_DEPTH['gear-missing-tooth'], rippleFraction: MESH_RIPPLE_FRACTION },
    gates: ['more-than-one-line', 'wide-sidebands', 'once-per-turn'],
  },
  'gear-broken-tooth': {
    kind: 'gear-broken-tooth', domain: 'spectrum', ownsRunningLines: false, evidence: 'chance', level: 'tooth-drop', cepstralSupport: true,
    prediction: { depthFraction: TOOTH_DROP_DEPTH['gear-broken-tooth'], rippleFraction: MESH_RIPPLE_FRACTION },
    gates: ['more-than-one-line', 'wide-sidebands', 'once-per-turn'],
  },
  'gear-wear': {
    kind: 'gear-wear', domain: 'spectrum', ownsRunningLines: true, evidence: 'presence', level: 'mesh-harmonics', cepstralSupport: false,
    gates: ['more-than-one-line', 'needs-baseline'],
  },
  'gear-eccentricity': {
    kind: 'gear-eccentricity', domain: 'spectrum', ownsRunningLines: false, evidence: 'chance', level: 'presence', cepstralSupport: true,
    gates: ['more-than-one-line'],
  },
  'bearing-outer-race': {
    kind: 'bearing-outer-race', domain: 'envelope', ownsRunningLines: false, evidence: 'chance', level: 'presence', cepstralSupport: false,
    // A defect fixed in the outer race is struck at BPFO with the same strength each time; a load that turns with
    // the shaft (unbalance) can still modulate it at 1×, and unequal rolling elements at FTF, so those sidebands
    // belong to its pattern but prove nothing.
    comb: { rate: 'bpfo', multiple: 1, rateLabel: 'BPFO', sideband: null, modulation: ['shaft', 'cage'] },
    gates: ['more-than-one-line'],
  },
  'bearing-inner-race': {
    kind: 'bearing-inner-race', domain: 'envelope', ownsRunningLines: false, evidence: 'chance', level: 'presence', cepstralSupport: false,
    // A defect on the inner race turns with the shaft through the load zone: BPFI with sidebands at 1×.
    comb: { rate: 'bpfi', multiple: 1, rateLabel: 'BPFI', sideband: 'shaft', modulation: ['shaft', 'cage'] },
    gates: ['more-than-one-line'],
  },
  'bearing-rolling-element': {
    kind: 'bearing-rolling-element', domain: 'envelope', ownsRunningLines: false, evidence: 'chance', level: 'presence', cepstralSupport: false,
    // A defect on a rolling element meets both races once per spin: a comb at twice BSF (Randall & Antoni 2011, §2.1;
    // an odd harmonic of BSF shows only when the two impacts differ), carried round by the cage: sidebands at FTF.
    comb: { rate: 'bsf', multiple: 2, rateLabel: 'BSF', sideband: 'cage', modulation: ['shaft', 'cage'] },
    gates: ['more-than-one-line'],
  },
  'bearing-cage': {
    kind: 'bearing-cage', domain: 'envelope', ownsRunningLines: false, evidence: 'chance', level: 'presence', cepstralSupport: false,
    comb: { rate: 'ftf', multiple: 1, rateLabel: 'FTF', sideband: null, modulation: [] },
    gates: ['more-than-one-line', 'with-bearing-damage'],
  },
  'electrical': {
    kind: 'electrical', domain: 'spectrum', ownsRunningLines: true, evidence: 'presence', level: 'iso-velocity', cepstralSupport: false,
    gates: [],
  },
};
