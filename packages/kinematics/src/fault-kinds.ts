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

export const faultComponentKinds: Readonly<Record<FaultKind, readonly FaultComponentKind[]>> = {
  'unbalance': ['shaft', 'rotor'],
  'misalignment': ['shaft'],
  'looseness': ['shaft'],
  'gear-missing-tooth': ['gear'],
  'gear-broken-tooth': ['gear'],
  'gear-wear': ['gear-mesh'],
  'gear-eccentricity': ['gear'],
  'bearing-outer-race': ['bearing'],
  'bearing-inner-race': ['bearing'],
  'bearing-rolling-element': ['bearing'],
  'bearing-cage': ['bearing'],
  'electrical': ['motor'],
};

export function isFaultKind(value: unknown): value is FaultKind {
  return typeof value === 'string' && (faultKinds as readonly string[]).includes(value);
}
