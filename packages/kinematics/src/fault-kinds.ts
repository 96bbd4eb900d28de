/**
 * The fault kinds of the machine-model contract and the kind of component each sits in
 * (machine-model.md, "Fault kinds and components"). The vocabulary lives here, beside the model it
 * refers to, so that the predictor (@kinespec/signatures) and the simulator (@kinespec/simulator),
 * whose physics are deliberately independent, name the same faults.
 */
export const faultKinds = [
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
  'bearing-cage',
  'electrical',
] as const;

export type FaultKind = (typeof faultKinds)[number];

/** What kind of component each fault sits in. */
export type FaultComponentKind = 'shaft' | 'rotor' | 'gear' | 'gear-mesh' | 'bearing' | 'motor';

/** The part of the machine a fault belongs to, which decides how it is looked for. */
export type FaultFamily = 'shaft' | 'gear' | 'bearing' | 'motor';

/**
 * What every part of Kinespec needs to know of a fault kind, in one place: the components it sits in, its family,
 * and its name in words (the noun phrase reasons use, "an inner-race defect"; a short title for tables). How the
 * diagnosis judges each kind is @kinespec/diagnosis' fault descriptor of the same kind; how it excites the machine is
 * @kinespec/signatures' excitation template.
 */
export interface FaultKindFacts {
  componentKinds: readonly FaultComponentKind[];
  family: FaultFamily;
  phrase: string;
  title: string;
}

export const faultKindFacts: Readonly<Record<FaultKind, FaultKindFacts>> = {
  'unbalance': { componentKinds: ['shaft', 'rotor'], family: 'shaft', phrase: 'unbalance', title: 'Unbalance' },
  'misalignment': { componentKinds: ['shaft'], family: 'shaft', phrase: 'misalignment', title: 'Misalignment' },
  'looseness': { componentKinds: ['shaft'], family: 'shaft', phrase: 'mechanical looseness', title: 'Looseness' },
  'gear-missing-tooth': { componentKinds: ['gear'], family: 'gear', phrase: 'a missing tooth', title: 'Missing tooth' },
  'gear-broken-tooth': { componentKinds: ['gear'], family: 'gear', phrase: 'a broken or chipped tooth', title: 'Broken tooth' },
  'gear-wear': { componentKinds: ['gear-mesh'], family: 'gear', phrase: 'tooth wear', title: 'Tooth wear' },
  'gear-eccentricity': { componentKinds: ['gear'], family: 'gear', phrase: 'an eccentric gear', title: 'Eccentric gear' },
  'bearing-outer-race': { componentKinds: ['bearing'], family: 'bearing', phrase: 'an outer-race defect', title: 'Outer race' },
  'bearing-inner-race': { componentKinds: ['bearing'], family: 'bearing', phrase: 'an inner-race defect', title: 'Inner race' },
  'bearing-rolling-element': { componentKinds: ['bearing'], family: 'bearing', phrase: 'a rolling-element defect', title: 'Rolling element' },
  'bearing-cage': { componentKinds: ['bearing'], family: 'bearing', phrase: 'a cage defect', title: 'Cage' },
  'electrical': { componentKinds: ['motor'], family: 'motor', phrase: 'an electrical fault', title: 'Electrical' },
};

export const faultComponentKinds: Readonly<Record<FaultKind, readonly FaultComponentKind[]>> = Object.fromEntries(
  faultKinds.map((k) => [k, faultKindFacts[k].componentKinds]),
) as Record<FaultKind, readonly FaultComponentKind[]>;

export function isFaultKind(value: unknown): value is FaultKind {
  return typeof value === 'string' && (faultKinds as readonly string[]).includes(value);
}
