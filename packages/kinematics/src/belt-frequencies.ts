/**
 * Belt pass frequency: how often one point of the belt passes a given place (a splice, a damaged section
 * passing a sheave), i.e. belt speed over belt length. The belt moves with its driver sheave; slip is at the driven one.
 */
// Common practice: f_belt = π·D·n / L (D driver pitch diameter, n driver speed in rev/s, L belt pitch length).
export function beltPassFrequencyHz(driverPitchDiameterMm: number, driverSpeedHz: number, beltLengthMm: number): number {
  return (Math.PI * driverPitchDiameterMm * driverSpeedHz) / beltLengthMm;
}
