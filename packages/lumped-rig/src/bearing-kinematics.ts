/**
 * Rolling-element bearing kinematics: defect frequencies and contact surface speeds from the geometry, for a
 * stationary outer ring and an inner ring turning with the shaft, no slip.
 */
export interface RollingBearingGeometry {
  rollingElements: number;
  rollingElementDiameterMm: number;
  pitchDiameterMm: number;
  contactAngleDeg: number;
}

export interface DefectFrequencies {
  /** Ball pass frequency, outer race. */
  bpfoHz: number;
  /** Ball pass frequency, inner race. */
  bpfiHz: number;
  /** Ball (element) spin frequency, once per element revolution; a spall on an element strikes at 2×BSF. */
  bsfHz: number;
  /** Fundamental train (cage) frequency. */
  ftfHz: number;
}

export function checkBearingGeometry(g: RollingBearingGeometry): void {
  if (!(Number.isInteger(g.rollingElements) && g.rollingElements >= 3)) throw new RangeError(`rollingElements (${g.rollingElements}) must be a whole number >= 3`);
  if (!(g.rollingElementDiameterMm > 0)) throw new RangeError(`rollingElementDiameterMm (${g.rollingElementDiameterMm}) must be > 0`);
  if (!(g.pitchDiameterMm > g.rollingElementDiameterMm)) throw new RangeError(`pitchDiameterMm (${g.pitchDiameterMm}) must exceed rollingElementDiameterMm (${g.rollingElementDiameterMm})`);
  if (!(g.contactAngleDeg >= 0 && g.contactAngleDeg < 90)) throw new RangeError(`contactAngleDeg (${g.contactAngleDeg}) must be in [0, 90)`);
}

/**
 * The four defect frequencies (Randall & Antoni 2011, "Rolling element bearing diagnostics — a tutorial", MSSP
 * 25:485-520, eqs. 1-4):
 *   BPFO = (n f_r / 2)(1 − (d/D) cos φ),  BPFI = (n f_r / 2)(1 + (d/D) cos φ),
 *   FTF = (f_r / 2)(1 − (d/D) cos φ),     BSF = (D / 2d) f_r (1 − ((d/D) cos φ)²).
 */
export function defectFrequenciesHz(g: RollingBearingGeometry, shaftSpeedHz: number): DefectFrequencies {
  checkBearingGeometry(g);
  if (!(shaftSpeedHz > 0)) throw new RangeError(`shaftSpeedHz (${shaftSpeedHz}) must be > 0`);
  const ratio = (g.rollingElementDiameterMm / g.pitchDiameterMm) * Math.cos((g.contactAngleDeg * Math.PI) / 180);
  const n = g.rollingElements;
  return {
    bpfoHz: ((n * shaftSpeedHz) / 2) * (1 - ratio),
    bpfiHz: ((n * shaftSpeedHz) / 2) * (1 + ratio),
    ftfHz: (shaftSpeedHz / 2) * (1 - ratio),
    bsfHz: (g.pitchDiameterMm / (2 * g.rollingElementDiameterMm)) * shaftSpeedHz * (1 - ratio * ratio),
  };
}

/**
 * Speed (m/s) at which an element's contact rolls over a defect of each kind, for the time it takes to cross a
 * spall: outer race at the cage rate times the outer contact radius; inner race at the shaft rate relative to the
 * cage times the inner contact radius; an element's own surface at its spin rate times its radius (pure rolling;
 * geometry as in Harris & Kotzalas, Rolling Bearing Analysis, ch. on bearing kinematics; from memory).
 */
export function contactRollingSpeedsMPerS(g: RollingBearingGeometry, shaftSpeedHz: number): { outerRace: number; innerRace: number; rollingElement: number } {
  const f = defectFrequenciesHz(g, shaftSpeedHz);
  const cosPhi = Math.cos((g.contactAngleDeg * Math.PI) / 180);
  const pitchM = g.pitchDiameterMm / 1000;
  const elementM = g.rollingElementDiameterMm / 1000;
  const outerContactRadius = (pitchM + elementM * cosPhi) / 2;
  const innerContactRadius = (pitchM - elementM * cosPhi) / 2;
  return {
    outerRace: 2 * Math.PI * f.ftfHz * outerContactRadius,
    innerRace: 2 * Math.PI * (shaftSpeedHz - f.ftfHz) * innerContactRadius,
    rollingElement: 2 * Math.PI * f.bsfHz * (elementM / 2),
  };
}
