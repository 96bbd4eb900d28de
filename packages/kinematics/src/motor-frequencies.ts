// Common practice: synchronous speed n_s = 120·f/p rpm, i.e. 2·f/p in rev/s.
export function synchronousSpeedHz(lineFrequencyHz: number, poles: number): number {
  return (2 * lineFrequencyHz) / poles;
}

/** Slip frequency of an induction motor: synchronous speed minus rotor speed (0 at or above synchronous). */
// Common practice: f_slip = n_s − n (both in Hz).
export function slipFrequencyHz(lineFrequencyHz: number, poles: number, rotorSpeedHz: number): number {
  return Math.max(0, synchronousSpeedHz(lineFrequencyHz, poles) - rotorSpeedHz);
}

/** Pole pass frequency: the beat of rotor-bar faults seen as sidebands around 1× and 2 × line frequency. */
// Common practice: f_pp = p · f_slip.
export function polePassFrequencyHz(lineFrequencyHz: number, poles: number, rotorSpeedHz: number): number {
  return poles * slipFrequencyHz(lineFrequencyHz, poles, rotorSpeedHz);
}
