import { unitError } from './unit-error.js';

/** The motion quantities a vibration channel can carry. */
export type Quantity = 'acceleration' | 'velocity' | 'displacement';

/** Canonical unit names (plain ASCII, as decoders write them). */
export type MotionUnit = 'g' | 'm/s^2' | 'mm/s^2' | 'm/s' | 'mm/s' | 'in/s' | 'm' | 'mm' | 'um' | 'mils';

interface UnitDefinition {
  quantity: Quantity;
  /** Multiply by this to get SI (m/s^2, m/s, m). */
  toSi: number;
}

// g_n = 9.80665 m/s^2 exactly: 3rd CGPM (1901), CR 70; ISO 80000-3; NIST SP 330 (2008)
export const STANDARD_GRAVITY_M_PER_S2 = 9.80665;
// international inch = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811)
const INCH_M = 0.0254;

const UNITS: Readonly<Record<MotionUnit, UnitDefinition>> = {
  g: { quantity: 'acceleration', toSi: STANDARD_GRAVITY_M_PER_S2 },
  'm/s^2': { quantity: 'acceleration', toSi: 1 },
  'mm/s^2': { quantity: 'acceleration', toSi: 1e-3 },
  'm/s': { quantity: 'velocity', toSi: 1 },
  'mm/s': { quantity: 'velocity', toSi: 1e-3 },
  'in/s': { quantity: 'velocity', toSi: INCH_M },
  m: { quantity: 'displacement', toSi: 1 },
  mm: { quantity: 'displacement', toSi: 1e-3 },
  um: { quantity: 'displacement', toSi: 1e-6 },
  // 1 mil = 0.001 in = 0.0254 mm
  mils: { quantity: 'displacement', toSi: INCH_M * 1e-3 },
};

export const MOTION_UNITS: readonly MotionUnit[] = Object.keys(UNITS) as MotionUnit[];

/** Spellings met in files, mapped to the canonical name. */
const ALIASES: Readonly<Record<string, MotionUnit>> = {
  gn: 'g',
  'm/s2': 'm/s^2',
  'm/s²': 'm/s^2',
  'm/s/s': 'm/s^2',
  'm s^-2': 'm/s^2',
  'mm/s2': 'mm/s^2',
  'mm/s²': 'mm/s^2',
  'in/sec': 'in/s',
  ips: 'in/s',
  µm: 'um',
  μm: 'um',
  micron: 'um',
  microns: 'um',
  mil: 'mils',
};

/** The customary unit for showing each quantity (common practice): g, mm/s, um. */
export const PREFERRED_UNIT: Readonly<Record<Quantity, MotionUnit>> = {
  acceleration: 'g',
  velocity: 'mm/s',
  displacement: 'um',
};

/** The canonical name of a unit, or undefined when it is not a motion unit (e.g. 'V', 'counts'). */
export function canonicalUnit(unit: string): MotionUnit | undefined {
  const u = unit.trim();
  if (Object.hasOwn(UNITS, u)) return u as MotionUnit;
  if (Object.hasOwn(ALIASES, u)) return ALIASES[u];
  return undefined;
}

export function isMotionUnit(unit: string): boolean {
  return canonicalUnit(unit) !== undefined;
}

/** The canonical name of a unit; throws SignalInputError 'unknown_unit' otherwise. */
export function normalizeUnit(unit: string, parameter = 'unit'): MotionUnit {
  const c = canonicalUnit(unit);
  if (c === undefined) {
    throw unitError('unknown_unit', `${parameter} '${unit}' is not a known motion unit (one of ${MOTION_UNITS.join(', ')})`);
  }
  return c;
}

export function quantityOfUnit(unit: string, parameter = 'unit'): Quantity {
  return UNITS[normalizeUnit(unit, parameter)].quantity;
}

/** The SI unit of a quantity: m/s^2, m/s or m. */
export function siUnitOf(quantity: Quantity): MotionUnit {
  return quantity === 'acceleration' ? 'm/s^2' : quantity === 'velocity' ? 'm/s' : 'm';
}

/** Factor f with value_in_to = f * value_in_from; throws 'incompatible_units' across quantities. */
export function unitScaleFactor(from: string, to: string): number {
  const a = UNITS[normalizeUnit(from, 'from')];
  const b = UNITS[normalizeUnit(to, 'to')];
  if (a.quantity !== b.quantity) {
    throw unitError(
      'incompatible_units',
      `cannot convert '${from}' (${a.quantity}) to '${to}' (${b.quantity}) by scaling; use integrateSignal or integrateSpectrum`,
    );
  }
  return a.toSi / b.toSi;
}

/** Converts a value or every sample of an array (returning a new array) between units of one quantity. */
export function convertUnit(value: number, from: string, to: string): number;
export function convertUnit(value: Float64Array, from: string, to: string): Float64Array;
export function convertUnit(value: number | Float64Array, from: string, to: string): number | Float64Array {
  const f = unitScaleFactor(from, to);
  if (typeof value === 'number') return value * f;
  const out = new Float64Array(value.length);
  for (let i = 0; i < value.length; i++) out[i] = value[i] * f;
  return out;
}
