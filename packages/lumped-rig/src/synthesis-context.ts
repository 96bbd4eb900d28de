import type { Random } from './random.js';
import { shaftSpeedsHz, type RigMachine } from './rig-machine.js';
import type { FaultSize, RigFault } from './rig-faults.js';

/** What every stage of one recording's synthesis shares: the plan's machine and point, its draws, and the grid. */
export interface SynthesisContext {
  machine: RigMachine;
  pointId: string;
  faults: readonly RigFault[];
  random: Random;
  /** Nuisance parameters drawn so far, for reports. */
  draws: Record<string, number | string>;
  /** Physical size of each fault once a stage has built it (undefined: no stage could). */
  faultSizes: Array<FaultSize | undefined>;
  drive: DrivePoint;
  grid: Grid;
}

/** The integration grid: `count` samples of `stepS` from `startS` (negative: the run-in comes first). */
export interface Grid {
  stepS: number;
  startS: number;
  count: number;
  /** Samples of run-in and filter margin before t = 0. */
  preCount: number;
  /** Integration rate over output rate. */
  factor: number;
}

/** The machine's running state for one recording. */
export interface DrivePoint {
  speedRpm: number;
  minRpm: number;
  maxRpm: number;
  /** Every shaft's true speed, Hz. */
  speedsHz: Record<string, number>;
  motorShaft: string;
  poles: number;
  ratedTorqueNm: number;
  motorTorqueNm: number;
  /** Supply frequency the drive feeds the motor, Hz. */
  supplyHz: number;
}

/**
 * The running state: true belt slip, load and motor torque at the speed asked for. Fan loads follow the affinity law,
 * torque ∝ speed² (common practice); the others hold their torque. The supply frequency of an induction motor on a
 * variable-speed drive is f = (p/2)·f_rotor/(1 − s), the slip in proportion to the load (linear region).
 */
export function drivePoint(machine: RigMachine, speedRpm: number, random: Random, draws: Record<string, number | string>): DrivePoint {
  const model = machine.model;
  const beltSlip = machine.beltSlipPercentRange ? random.between(...machine.beltSlipPercentRange) : 0;
  if (machine.beltSlipPercentRange) draws.beltSlipPercent = beltSlip;
  const speedsHz = shaftSpeedsHz(machine, speedRpm, beltSlip);
  const maxRpm = model.speed.maxRpm ?? model.speed.nominalRpm;
  const minRpm = model.speed.minRpm ?? model.speed.nominalRpm;
  const ratedTorqueNm = (machine.drive.ratedPowerKw * 1000) / ((model.speed.nominalRpm * 2 * Math.PI) / 60);
  const loadFraction = random.between(...machine.drive.loadFractionRange);
  draws.loadFraction = loadFraction;
  const speedRatio = speedRpm / maxRpm;
  const motorTorqueNm = ratedTorqueNm * loadFraction * (machine.drive.loadLaw === 'fan' ? speedRatio * speedRatio : 1);
  const motorShaft = model.motor?.shaft ?? model.speed.shaft;
  const poles = model.motor?.poles ?? 4;
  const runningSlip = machine.drive.ratedSlip * (motorTorqueNm / ratedTorqueNm);
  const supplyHz = ((poles / 2) * speedsHz[motorShaft]!) / (1 - runningSlip);
  return { speedRpm, minRpm, maxRpm, speedsHz, motorShaft, poles, ratedTorqueNm, motorTorqueNm, supplyHz };
}
