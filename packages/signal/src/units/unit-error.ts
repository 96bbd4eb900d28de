import { SignalInputError } from '../errors.js';

/** Every code the units area throws, with a title for a problem-type registry (stable codes). */
export const unitErrorDescriptions = {
  unknown_unit: 'The unit is not a known acceleration, velocity or displacement unit.',
  incompatible_units: 'The two units belong to different quantities, or the conversion would need differentiation.',
  invalid_cutoff: 'The low-frequency cutoff of integration is not a finite frequency > 0.',
  sample_rate_invalid: 'The sample rate is missing, zero, negative or not a finite number.',
} as const satisfies Record<string, string>;

export type UnitErrorCode = keyof typeof unitErrorDescriptions;

export function unitError(code: UnitErrorCode, message: string, where?: string): SignalInputError {
  return new SignalInputError(code, message, where);
}
