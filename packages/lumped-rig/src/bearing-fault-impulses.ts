import { bearingImpacts, type BearingDefectKind } from './bearing-impacts.js';
import type { GearStageGeometry } from './gear-geometry.js';
import { radialShare } from './point-forces.js';
import { bearingTransmission, type RigMachine } from './rig-machine.js';
import { FAULT_SIZE_RANGES, isBearingFault } from './rig-faults.js';
import type { ImpulseTrain } from './structural-path.js';
import type { SynthesisContext } from './synthesis-context.js';

/** The bearing-defect jitter of Antoni & Randall's model: 1-2 % of the period. */
export const BEARING_JITTER_FRACTION: [number, number] = [0.01, 0.02];
/** Scatter of the impact amplitudes A_i (relative standard deviation; assumed, the model leaves it open). */
export const BEARING_AMPLITUDE_SCATTER = 0.15;
/** Load distribution factor ε of the bearings: 0.5 for zero clearance (a 180° zone), less with clearance (Harris & Kotzalas; from memory). */
export const LOAD_DISTRIBUTION_FACTOR: [number, number] = [0.3, 0.5];
/** Angle of an outer-race defect from the load-zone centre: spalls start where the load is (assumed ±30°). */
export const OUTER_RACE_DEFECT_ANGLE_RAD = Math.PI / 6;
/** V-belt shaft load as a multiple of the effective pull (common practice: 1.5-2.5). */
export const BELT_SHAFT_LOAD_FACTOR = 2;

/** The impacts of every bearing fault of the recording as the point's sensor axis receives them, sorted by time. */
export function bearingFaultImpulses(ctx: SynthesisContext, gearGeometries: readonly GearStageGeometry[]): ImpulseTrain {
  const { machine, pointId, faults, faultSizes, drive, grid } = ctx;
  const model = machine.model;
  const share = radialShare(ctx);
  const startS = grid.startS;
  const impulseTimes: number[] = [];
  const impulseSizes: number[] = [];
  const impactRandom = ctx.random.fork('bearings');
  faults.forEach((f, fi) => {
    if (!isBearingFault(f.fault)) return;
    const bearing = model.bearings.find((b) => b.id === f.component);
    const data = machine.bearings[f.component];
    if (bearing === undefined || data === undefined) throw new RangeError(`${model.id}: bearing ${f.component} is unknown to the rig`);
    const range = FAULT_SIZE_RANGES[f.fault];
    const spallMm = impactRandom.between(...range[f.severity]);
    faultSizes[fi] = { quantity: range.quantity, value: spallMm, unit: range.unit };
    const radialLoadN = data.weightLoadN + data.transmissionShare * transmissionForceN(machine, data.transmissionElement, drive.motorTorqueNm, gearGeometries);
    const kind: BearingDefectKind = f.fault === 'bearing-outer-race' ? 'outer-race' : f.fault === 'bearing-inner-race' ? 'inner-race' : 'rolling-element';
    const train = bearingImpacts(
      {
        kind,
        geometry: bearing,
        shaftSpeedHz: drive.speedsHz[bearing.shaft]!,
        elementKind: data.elementKind,
        radialLoadN,
        loadDistributionFactor: impactRandom.between(...LOAD_DISTRIBUTION_FACTOR),
        spallLengthM: spallMm / 1000,
        jitterFraction: impactRandom.between(...BEARING_JITTER_FRACTION),
        amplitudeScatter: BEARING_AMPLITUDE_SCATTER,
        defectAngleRad: impactRandom.between(-OUTER_RACE_DEFECT_ANGLE_RAD, OUTER_RACE_DEFECT_ANGLE_RAD),
        startAngleRad: impactRandom.between(0, 2 * Math.PI),
      },
      startS,
      startS + grid.count * grid.stepS,
      impactRandom,
    );
    const w = bearingTransmission(machine, pointId, bearing.id) * share;
    for (let i = 0; i < train.timeS.length; i++) {
      impulseTimes.push(train.timeS[i]!);
      impulseSizes.push(train.impulseNs[i]! * w);
    }
  });
  const order = impulseTimes.map((_, i) => i).sort((a, b) => impulseTimes[a]! - impulseTimes[b]!);
  return { timeS: Float64Array.from(order.map((i) => impulseTimes[i]!)), impulseNs: Float64Array.from(order.map((i) => impulseSizes[i]!)) };
}

/**
 * The force a bearing shares: the tooth force of its gear stage, F = T/r_b at the stage's pinion torque, or a belt's
 * shaft load (BELT_SHAFT_LOAD_FACTOR × the effective pull T/r of the driver sheave).
 */
function transmissionForceN(machine: RigMachine, element: string | undefined, motorTorqueNm: number, geometries: readonly { baseRadiusPinionM: number }[]): number {
  if (element === undefined) return 0;
  let torque = motorTorqueNm;
  for (let i = 0; i < machine.gearStages.length; i++) {
    const st = machine.gearStages[i]!;
    if (st.meshId === element) return torque / geometries[i]!.baseRadiusPinionM;
    torque = (torque * st.wheelTeeth) / st.pinionTeeth;
  }
  const belt = machine.model.belts.find((b) => b.id === element);
  if (belt !== undefined) return (BELT_SHAFT_LOAD_FACTOR * motorTorqueNm) / (belt.driver.pitchDiameterMm / 2000);
  throw new RangeError(`${machine.model.id}: transmission element ${element} is neither a gear mesh nor a belt`);
}
