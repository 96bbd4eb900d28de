import { assembleGearTrain, type AssembledGearTrain } from './gear-train-assembly.js';
import { gearTrainStepS, simulateGearTrain } from './gear-train.js';
import { casingTransmission, CROSS_AXIS_SHARE, isAxial, pointBearing, shaftOfGear, shaftTransmission } from './rig-machine.js';
import { FAULT_SIZE_RANGES } from './rig-faults.js';
import { harmonicForce, misalignmentHarmonics, unbalanceHarmonics, unbalanceKgM, type Harmonic } from './shaft-forces.js';
import type { DrivePoint, SynthesisContext } from './synthesis-context.js';

/** The forces along the sensor's axis at the housing of a point: gear bearing forces and shaft harmonics. */

/** Parallel offset a healthy, well-aligned coupling keeps, mm (a good alignment job reaches a few hundredths; common practice). */
export const HEALTHY_OFFSET_MM: [number, number] = [0.005, 0.02];
/**
 * Amplitude of the 1×, 2×, 3× misalignment reactions as fractions of the coupling's k·Δ (see shaft-forces.ts):
 * the angle-dependent part of a flexible coupling's stiffness is a modest fraction of its mean (assumed, 10-35 %),
 * with 2× the largest radially and the axial 1× and 2× high, the pattern common practice reads as misalignment.
 */
export const MISALIGNMENT_SHARES: { radial: ReadonlyArray<readonly [number, number]>; axial: ReadonlyArray<readonly [number, number]> } = {
  radial: [[0.1, 0.25], [0.15, 0.35], [0.03, 0.1]],
  axial: [[0.15, 0.35], [0.1, 0.3], [0.02, 0.08]],
};

/** Share of a force across the sensor's axis that it reads (see CROSS_AXIS_SHARE). */
export function radialShare(ctx: Pick<SynthesisContext, 'machine' | 'pointId'>): number {
  return isAxial(ctx.machine, ctx.pointId) ? CROSS_AXIS_SHARE : 1;
}

/**
 * The machine's gear train for this recording (null without gears), and the integration rate factor it needs:
 * the smallest multiple (>= 2) of the output rate at which RK4 keeps ω_max·h <= 0.6.
 */
export function gearTrainFor(machine: SynthesisContext['machine'], drive: DrivePoint, faults: SynthesisContext['faults'], random: SynthesisContext['random'], sampleRateHz: number): { assembled: AssembledGearTrain | null; factor: number } {
  if (machine.gearStages.length === 0) return { assembled: null, factor: 2 };
  const motorOmega = 2 * Math.PI * drive.speedsHz[drive.motorShaft]!;
  const outputOmega = 2 * Math.PI * drive.speedsHz[shaftOfGear(machine, machine.gearStages[machine.gearStages.length - 1]!.wheelId)]!;
  const syncOmega = (2 * Math.PI * drive.supplyHz) / (drive.poles / 2);
  // Linear torque-speed slope of the induction motor, T_rated / (s_rated·Ω_sync); a fan load's slope 2T/Ω.
  const motorSlope = drive.ratedTorqueNm / (machine.drive.ratedSlip * syncOmega);
  const loadTorque = drive.motorTorqueNm * (motorOmega / outputOmega);
  const loadSlope = machine.drive.loadLaw === 'fan' ? (2 * loadTorque) / outputOmega : 0;
  const assembled = assembleGearTrain(machine, { inputSpeedRadPerS: motorOmega, motorTorqueNm: drive.motorTorqueNm, motorTorqueSlopeNmsPerRad: motorSlope, loadTorqueSlopeNmsPerRad: loadSlope }, faults, random);
  return { assembled, factor: Math.max(2, Math.ceil(1 / (gearTrainStepS(assembled.spec) * sampleRateHz))) };
}

/** Adds the gear bodies' bearing forces (and, at an axial point, the helical teeth's axial push) to `force`. */
export function addGearForces(ctx: SynthesisContext, assembled: AssembledGearTrain, force: Float64Array): void {
  const { machine, pointId, grid } = ctx;
  const axial = isAxial(machine, pointId);
  const share = radialShare(ctx);
  const run = simulateGearTrain(assembled.spec, grid.stepS, grid.count);
  machine.gearStages.forEach((st, i) => {
    const pinionW = shaftTransmission(machine, pointId, shaftOfGear(machine, st.pinionId));
    const wheelW = shaftTransmission(machine, pointId, shaftOfGear(machine, st.wheelId));
    const pinionF = run.bearingForceN[2 * i]!;
    const wheelF = run.bearingForceN[2 * i + 1]!;
    for (let k = 0; k < grid.count; k++) force[k] = force[k]! + share * (pinionW * pinionF[k]! + wheelW * wheelF[k]!);
    const tanB = Math.tan(assembled.geometries[i]!.baseHelixAngleRad);
    if (axial && tanB > 0) {
      // Helical teeth push axially with tan βb of the transverse force, on both gears of the stage.
      const w = Math.max(pinionW, wheelW);
      const mf = run.meshForceN[i]!;
      for (let k = 0; k < grid.count; k++) force[k] = force[k]! + w * tanB * mf[k]!;
    }
  });
}

/**
 * Adds every shaft's harmonics to `force`: residual or faulty unbalance and misalignment, blade pass, magnetic
 * pull. Returns the 1× force amplitude of the point's own shaft (what a loose hold-down must resist).
 */
export function addShaftHarmonics(ctx: SynthesisContext, force: Float64Array): number {
  const { machine, pointId, faults, random, faultSizes, drive, grid } = ctx;
  const model = machine.model;
  const share = radialShare(ctx);
  const axial = isAxial(machine, pointId);
  const pointShaft = pointBearing(machine, pointId).shaft;
  let oneTimesAtPoint = 0;
  for (const shaft of model.shafts) {
    const data = machine.shafts[shaft.id];
    if (data === undefined) throw new RangeError(`${model.id}: shaft ${shaft.id} has no rig data`);
    const fHz = drive.speedsHz[shaft.id]!;
    const w = shaftTransmission(machine, pointId, shaft.id);
    const rotorIds = model.rotors.filter((r) => r.shaft === shaft.id).map((r) => r.id);
    const unbalanceFault = faults.findIndex((f) => f.fault === 'unbalance' && (f.component === shaft.id || rotorIds.includes(f.component)));
    let grade = random.between(...data.healthyBalanceGradeRange);
    if (unbalanceFault >= 0) {
      const range = FAULT_SIZE_RANGES.unbalance;
      grade = random.between(...range[faults[unbalanceFault]!.severity]);
      faultSizes[unbalanceFault] = { quantity: range.quantity, value: grade, unit: range.unit };
    }
    // The grade holds at this shaft's highest speed; at any other speed the same unbalance pulls with U·Ω².
    const shaftMaxOmega = 2 * Math.PI * fHz * (drive.maxRpm / drive.speedRpm);
    const U = unbalanceKgM(data.rotorMassKg, grade, shaftMaxOmega);
    const harmonics: Harmonic[] = unbalanceHarmonics(U, fHz, random.between(0, 2 * Math.PI)).map((h) => ({ ...h, amplitudeN: h.amplitudeN * w * share }));
    if (shaft.id === pointShaft) oneTimesAtPoint += harmonics[0]!.amplitudeN;
    const coupling = machine.couplings.find((c) => c.shaft === shaft.id);
    if (coupling !== undefined) {
      const misalignmentFault = faults.findIndex((f) => f.fault === 'misalignment' && f.component === shaft.id);
      let offsetMm = random.between(...HEALTHY_OFFSET_MM);
      if (misalignmentFault >= 0) {
        const range = FAULT_SIZE_RANGES.misalignment;
        offsetMm = random.between(...range[faults[misalignmentFault]!.severity]);
        faultSizes[misalignmentFault] = { quantity: range.quantity, value: offsetMm, unit: range.unit };
      }
      const draw = (r: readonly [number, number]) => random.between(r[0], r[1]);
      const shares = {
        radial: MISALIGNMENT_SHARES.radial.map(draw) as [number, number, number],
        axial: MISALIGNMENT_SHARES.axial.map(draw) as [number, number, number],
      };
      const phases = Array.from({ length: 6 }, () => random.between(0, 2 * Math.PI));
      const mis = misalignmentHarmonics(coupling.radialStiffnessNPerM, offsetMm / 1000, shares, phases);
      for (const h of mis.radial) harmonics.push({ ...h, amplitudeN: h.amplitudeN * w * share });
      if (axial) for (const h of mis.axial) harmonics.push({ ...h, amplitudeN: h.amplitudeN * w });
    }
    if (machine.bladePass !== undefined && rotorIds.includes(machine.bladePass.rotorId)) {
      const blades = model.rotors.find((r) => r.id === machine.bladePass!.rotorId)!.blades;
      const scale = (drive.speedRpm / drive.maxRpm) ** 2;
      harmonics.push({ order: blades, amplitudeN: machine.bladePass.forceAtMaxSpeedN * scale * w * share, phaseRad: random.between(0, 2 * Math.PI) });
      harmonics.push({ order: 2 * blades, amplitudeN: 0.3 * machine.bladePass.forceAtMaxSpeedN * scale * w * share, phaseRad: random.between(0, 2 * Math.PI) });
    }
    if (shaft.id === drive.motorShaft) {
      // Radial magnetic pull at twice the supply frequency, written as an order of this shaft.
      const wm = casingTransmission(machine, pointId, machine.drive.motorCasing);
      harmonics.push({ order: (2 * drive.supplyHz) / fHz, amplitudeN: machine.drive.magneticForceN * wm * share, phaseRad: random.between(0, 2 * Math.PI) });
    }
    harmonicForce(harmonics, fHz, grid.startS, grid.stepS, grid.count, force);
  }

  return oneTimesAtPoint;
}
