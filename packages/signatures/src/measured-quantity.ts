import type { Complex } from './complex.js';
import { SignatureInputError } from './errors.js';

/** What a predicted amplitude measures. 'angle' is torsional vibration read by a tach or encoder. */
export type MeasuredQuantity = 'acceleration' | 'velocity' | 'displacement' | 'angle';

/** Standard acceleration of gravity, m/s² (3rd CGPM 1901; ISO 80000-3). */
export const STANDARD_GRAVITY_M_PER_S2 = 9.80665;

/** Units per SI unit (m, m/s, m/s², rad) for every unit a point may use; spelled as @kinespec/kinematics pointUnits. */
const PER_SI: Record<MeasuredQuantity, Record<string, number>> = {
  acceleration: { 'g': 1 / STANDARD_GRAVITY_M_PER_S2, 'm/s^2': 1, 'mm/s^2': 1e3 },
  velocity: { 'mm/s': 1e3, 'm/s': 1, 'in/s': 1 / 0.0254 },
  // 1 mil = 0.001 in = 25.4 µm (international inch, 1959)
  displacement: { 'um': 1e6, 'mm': 1e3, 'm': 1, 'mil': 1 / 25.4e-6 },
  angle: { 'rad': 1, 'mrad': 1e3, 'deg': 180 / Math.PI },
};

/** The factor from the SI unit of `quantity` to `unit`; throws for a unit the quantity does not have. */
export function unitsPerSi(quantity: MeasuredQuantity, unit: string): number {
  const f = PER_SI[quantity]?.[unit];
  if (f === undefined) {
    throw new SignatureInputError('unsupported_unit', `unit ('${unit}') must be one of ${Object.keys(PER_SI[quantity] ?? {}).map((u) => `'${u}'`).join(', ')} for ${quantity}`);
  }
  return f;
}

/**
 * From a displacement phasor (m, or rad for 'angle') at `frequencyHz` to the measured quantity in its SI unit:
 * each time derivative multiplies by jω (v = jωx, a = −ω²x for a sinusoid; check-values.md §8, common practice).
 */
export function fromDisplacement(displacement: Complex, frequencyHz: number, quantity: MeasuredQuantity): Complex {
  const w = 2 * Math.PI * frequencyHz;
  switch (quantity) {
    case 'displacement':
    case 'angle':
      return displacement;
    case 'velocity':
      return { re: -w * displacement.im, im: w * displacement.re };
    case 'acceleration':
      return { re: -w * w * displacement.re, im: -w * w * displacement.im };
  }
}

/** How many time derivatives lie between displacement and the quantity (0, 1, 2). */
export function derivativeOrder(quantity: MeasuredQuantity): number {
  return quantity === 'velocity' ? 1 : quantity === 'acceleration' ? 2 : 0;
}
