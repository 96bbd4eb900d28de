import { SignalInputError } from '../errors.js';
import { canonicalUnit, MOTION_UNITS } from './unit-registry.js';
import { nearestName } from './nearest-name.js';

/*
 * Which units a recording's channel may carry. Vibration channels carry a motion unit (unit-registry.ts);
 * tach and encoder channels carry the pulse train's voltage or a counter's value; PCM without a sensitivity
 * comes out in fractions of digital full scale. Anything else is refused where it enters (a decoder option,
 * a CSV header, a JSON field), never carried along under a name nobody can convert.
 */

/** Units that are not motion units, each with what it is for. */
export const SIGNAL_UNITS = {
  V: 'volts: a tach or encoder pulse train',
  mV: 'millivolts: a tach or encoder pulse train',
  counts: 'counter values: an encoder read as a count',
  FS: 'fraction of digital full scale: PCM read without a sensitivity',
} as const satisfies Record<string, string>;

export type SignalUnit = keyof typeof SIGNAL_UNITS;

/** What a decoder writes as a channel's unit when neither the file nor the caller gives one. */
export const UNSTATED_UNIT = 'unknown';

/** Every unit a channel may be given, canonical spellings (aliases such as 'm/s2', 'ips', 'µm' are read too). */
export const ACCEPTED_UNITS: readonly string[] = Object.freeze([...MOTION_UNITS, ...(Object.keys(SIGNAL_UNITS) as SignalUnit[])]);

/** The accepted units as one line for messages: "g, m/s^2, … (vibration); V, mV, counts, FS (signals)". */
export function acceptedUnitsText(): string {
  return `${MOTION_UNITS.join(', ')} (vibration); ${Object.keys(SIGNAL_UNITS).join(', ')} (tach, encoder, full scale)`;
}

/** The canonical spelling of a channel unit, or undefined when it is not one Kinespec knows. */
export function canonicalChannelUnit(unit: string): string | undefined {
  const motion = canonicalUnit(unit);
  if (motion !== undefined) return motion;
  const u = unit.trim();
  return Object.hasOwn(SIGNAL_UNITS, u) ? u : undefined;
}

/**
 * The canonical spelling of `unit`, or SignalInputError 'unknown_unit' naming where it came from, the nearest
 * accepted unit when it looks like a slip, and the whole accepted list.
 * @param source what carried the unit, for the message: "unit", "--unit", "column 'DE-H'" (then ": 'furlongs' is not…")
 */
export function checkChannelUnit(unit: string, source: string, where?: string): string {
  const canonical = typeof unit === 'string' ? canonicalChannelUnit(unit) : undefined;
  if (canonical !== undefined) return canonical;
  const text = String(unit);
  const near = nearestName(text, ACCEPTED_UNITS);
  throw new SignalInputError(
    'unknown_unit',
    `${source}: '${text}' is not a unit Kinespec knows${near ? ` (did you mean '${near}'?)` : ''}; accepted: ${acceptedUnitsText()}`,
    where,
  );
}
