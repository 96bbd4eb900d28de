import type { GearStageSpec } from './gear-geometry.js';
import type { MachineModelDocument, ModelBearing, ModelPoint } from './machine-model-document.js';

/**
 * A machine of the rig: its machine-model document (what a user of Kinespec would write) and the physical data the
 * simulation needs beyond it (what the machine's maker would know). Torsional inertias and link stiffnesses are read
 * from the document's `torsional` section, so each lives in one place.
 */
export interface RigMachine {
  model: MachineModelDocument;
  drive: DriveSpec;
  /** Gear stages in order from the motor (empty for a machine without gears). */
  gearStages: GearStageSpec[];
  /** Physical data per gear body (gear id). */
  gearBodies: Record<string, GearBodySpec>;
  /** Torsional inertia ids of the chain (gear machines): the motor rotor and the driven load. */
  motorInertiaId?: string;
  loadInertiaId?: string;
  /** Flexible couplings of the drive (shaft-to-shaft joints), for misalignment. */
  couplings: CouplingSpec[];
  shafts: Record<string, ShaftSpec>;
  bearings: Record<string, BearingSpec>;
  /** Effective housing mass seen at each point (kg): the modal mass of the housing's motion at the sensor. */
  pointHousingMassKg: Record<string, number>;
  /** Belt drives: the true slip (%) of each recording is drawn from this range, which need not match the model's. */
  beltSlipPercentRange?: [number, number];
  /** Aerodynamic blade-pass force of a fan impeller at the highest speed, N (rises with the square of the speed). */
  bladePass?: { rotorId: string; forceAtMaxSpeedN: number };
}

export interface DriveSpec {
  ratedPowerKw: number;
  /** Slip of the induction motor at rated torque, fraction (sets its torque-speed slope). */
  ratedSlip: number;
  /** 'constant-torque' (conveyors, crushers, screens) or 'fan' (torque ∝ speed², affinity law). */
  loadLaw: 'constant-torque' | 'fan';
  /** Range of the running load as a fraction of rated torque at the highest speed. */
  loadFractionRange: [number, number];
  /** Radial magnetic pull at twice line frequency of a healthy motor, N (common practice: a small 2×LF line). */
  magneticForceN: number;
  /** The casing of the motor's own bearings: a sensor in another casing hears its pull across the coupling. */
  motorCasing: string;
}

export interface GearBodySpec {
  /** Mass moving with the body along the line of action (gear and shaft share), kg. */
  massKg: number;
  /** Radial stiffness of the body's bearings along the line of action, N/m. */
  supportStiffnessNPerM: number;
}

export interface CouplingSpec {
  id: string;
  /** The shaft whose bearings take the coupling's reaction (the misalignment fault's component). */
  shaft: string;
  radialStiffnessNPerM: number;
}

export interface ShaftSpec {
  /** The casing (gearbox, motor frame, pedestals) its bearings sit in: sources in one casing reach each other's sensors. */
  casing: string;
  /** Rotating mass whose unbalance loads this shaft's bearings, kg. */
  rotorMassKg: number;
  /** Balance grade of a healthy machine, mm/s (ISO 21940-11 G), drawn in this range. */
  healthyBalanceGradeRange: [number, number];
}

export interface BearingSpec {
  elementKind: 'ball' | 'roller';
  /** Static radial load from weights, N. */
  weightLoadN: number;
  /** Share of a gear stage's tooth force, or of the belt pull, this bearing carries. */
  transmissionShare: number;
  /** The gear mesh whose force it shares (for a belt drive: the belt id). */
  transmissionElement?: string;
}

// ---------------------------------------------------------------------------------------------
// Topology: which sources a sensor hears, and how strongly.

/** The bearing a point sits on. */
export function pointBearing(machine: RigMachine, pointId: string): ModelBearing {
  const point = findPoint(machine, pointId);
  const bearing = machine.model.bearings.find((b) => b.id === point.near);
  if (bearing === undefined) throw new RangeError(`point ${pointId} is not near a bearing of ${machine.model.id}`);
  return bearing;
}

export function findPoint(machine: RigMachine, pointId: string): ModelPoint {
  const point = machine.model.points.find((p) => p.id === pointId);
  if (point === undefined) throw new RangeError(`pointId (${pointId}) is not a point of ${machine.model.id}`);
  return point;
}

export function shaftOfGear(machine: RigMachine, gearId: string): string {
  for (const m of machine.model.gearMeshes) {
    if (m.driver.gear === gearId) return m.driver.shaft;
    if (m.driven.gear === gearId) return m.driven.shaft;
  }
  throw new RangeError(`gear ${gearId} is not in ${machine.model.id}`);
}

/**
 * Transmission from a source on a shaft to a point: 1 on the point's own shaft, TRANSMISSION.sameCasing to another
 * shaft in the same casing, TRANSMISSION.otherCasing across a coupling or belt (assumed values: a housing passes a
 * fraction of a neighbour's forces to the sensor; the fractions are order-of-magnitude choices, kept in one place).
 */
export const TRANSMISSION = { sameShaft: 1, sameCasing: 0.3, otherCasing: 0.05 } as const;

export function shaftTransmission(machine: RigMachine, pointId: string, sourceShaft: string): number {
  const pointShaft = pointBearing(machine, pointId).shaft;
  if (pointShaft === sourceShaft) return TRANSMISSION.sameShaft;
  const a = machine.shafts[pointShaft];
  const b = machine.shafts[sourceShaft];
  if (a === undefined || b === undefined) throw new RangeError(`shaft ${a === undefined ? pointShaft : sourceShaft} has no rig data in ${machine.model.id}`);
  return a.casing === b.casing ? TRANSMISSION.sameCasing : TRANSMISSION.otherCasing;
}

/** Transmission from a source in a named casing (the motor's magnetic pull) to a point. */
export function casingTransmission(machine: RigMachine, pointId: string, casing: string): number {
  const pointShaft = pointBearing(machine, pointId).shaft;
  return machine.shafts[pointShaft]!.casing === casing ? TRANSMISSION.sameShaft : TRANSMISSION.otherCasing;
}

/** A bearing's own impacts reach its point fully, the other bearing of the shaft at half (assumed), others by casing. */
export function bearingTransmission(machine: RigMachine, pointId: string, bearingId: string): number {
  const own = pointBearing(machine, pointId);
  if (own.id === bearingId) return 1;
  const bearing = machine.model.bearings.find((b) => b.id === bearingId);
  if (bearing === undefined) throw new RangeError(`bearing ${bearingId} is not in ${machine.model.id}`);
  if (bearing.shaft === own.shaft) return 0.5;
  return shaftTransmission(machine, pointId, bearing.shaft);
}

/**
 * Cross-axis share: what an accelerometer mounted along one axis reads of a force along another (mounting and
 * housing coupling; assumed, common practice puts cross-axis sensitivity and housing coupling at tens of percent).
 */
export const CROSS_AXIS_SHARE = 0.25;

export function isAxial(machine: RigMachine, pointId: string): boolean {
  return findPoint(machine, pointId).direction === 'axial';
}

/**
 * Speed of every shaft (Hz) for a reference shaft speed, through gear meshes (tooth ratio) and belts
 * (pitch-diameter ratio and the belt's true slip, which the caller draws).
 */
export function shaftSpeedsHz(machine: RigMachine, referenceRpm: number, beltSlipPercent: number): Record<string, number> {
  const model = machine.model;
  const speeds: Record<string, number> = { [model.speed.shaft]: referenceRpm / 60 };
  for (let pass = 0; pass < model.shafts.length; pass++) {
    for (const m of model.gearMeshes) {
      const a = speeds[m.driver.shaft];
      const b = speeds[m.driven.shaft];
      if (a !== undefined && b === undefined) speeds[m.driven.shaft] = (a * m.driver.teeth) / m.driven.teeth;
      if (b !== undefined && a === undefined) speeds[m.driver.shaft] = (b * m.driven.teeth) / m.driver.teeth;
    }
    for (const belt of model.belts) {
      const a = speeds[belt.driver.shaft];
      const b = speeds[belt.driven.shaft];
      const ratio = (belt.driver.pitchDiameterMm / belt.driven.pitchDiameterMm) * (1 - beltSlipPercent / 100);
      if (a !== undefined && b === undefined) speeds[belt.driven.shaft] = a * ratio;
      if (b !== undefined && a === undefined) speeds[belt.driver.shaft] = b / ratio;
    }
  }
  for (const s of model.shafts) if (speeds[s.id] === undefined) throw new RangeError(`shaft ${s.id} of ${model.id} is connected to nothing`);
  return speeds;
}
