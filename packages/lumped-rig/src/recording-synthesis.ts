import { decimate, TAPS_PER_FACTOR } from './anti-alias-decimator.js';
import { bearingImpacts, type BearingDefectKind } from './bearing-impacts.js';
import { assembleGearTrain } from './gear-train-assembly.js';
import { gearTrainStepS, simulateGearTrain } from './gear-train.js';
import { looseSupportAcceleration } from './loose-support.js';
import { createRandom, type Random } from './random.js';
import {
  bearingTransmission,
  casingTransmission,
  CROSS_AXIS_SHARE,
  findPoint,
  isAxial,
  pointBearing,
  shaftOfGear,
  shaftSpeedsHz,
  shaftTransmission,
  type RigMachine,
} from './rig-machine.js';
import { FAULT_SIZE_RANGES, LOOSENESS_HOLDING_FRACTION, isBearingFault, type FaultSize, type RigFault } from './rig-faults.js';
import { harmonicForce, misalignmentHarmonics, unbalanceHarmonics, unbalanceKgM, type Harmonic } from './shaft-forces.js';
import { sensorNoise, type NoiseColour } from './sensor-noise.js';
import { diracAreas, mountAcceleration, resonanceResponse, type ImpulseTrain, type MountSpec, type Resonance } from './structural-path.js';

/** Standard gravity (m/s²), ISO 80000-3 / CGPM 1901: the accelerometer's g. */
export const STANDARD_GRAVITY = 9.80665;

/** A recording as @kinespec/signal's `Recording` (same shape; this package imports nothing at run time). */
export interface RigRecording {
  sampleRateHz: number;
  channels: Array<{ name: string; unit: string; samples: Float64Array }>;
  metadata: Record<string, string>;
}

export interface SynthesisPlan {
  machine: RigMachine;
  pointId: string;
  /** True mean speed of the model's reference shaft, rpm. */
  speedRpm: number;
  sampleRateHz: number;
  durationS: number;
  faults: readonly RigFault[];
  seed: number;
  /** Sensor noise: r.m.s. (g) and colour. */
  noise: { rmsG: number; colour: NoiseColour };
  /** Broadband machine noise (flow, rolling, neighbours) at the sensor through the local resonances, r.m.s. g. */
  backgroundRmsG: number;
}

export interface SynthesisResult {
  recording: RigRecording;
  /** True speed of every shaft (rpm), belt slip included. */
  shaftSpeedsRpm: Record<string, number>;
  /** Physical size of each fault, in the order of `plan.faults`. */
  faultSizes: FaultSize[];
  /** The random nuisance parameters of this recording, for reports (never given to an analysis). */
  draws: Record<string, number | string>;
}

/**
 * The mount's natural frequency relative to running speed, per ISO foundation class: ISO 10816-3 calls a foundation
 * rigid when the lowest natural frequency of machine and foundation lies at least 25 % above the running speed and
 * flexible otherwise (from memory), so a flexible mount is drawn at 0.3-0.7 × the lowest speed and a rigid one
 * at 2.5-5 × the highest: a bolted machine is also kept off its own 2× (where misalignment and transmission-error
 * harmonics would otherwise ring the mount in a healthy machine; a design practice, assumed). Its damping, 8-20 %
 * of critical: a machine on its foundation loses energy into the ground and the grout, more than a free structure
 * (assumed).
 */
export const MOUNT_FREQUENCY_RATIO: Record<'rigid' | 'flexible', [number, number]> = { rigid: [2.5, 5], flexible: [0.3, 0.7] };
export const MOUNT_DAMPING_RATIO: [number, number] = [0.08, 0.2];
/**
 * Local structural resonances (housing wall, pedestal, sensor mount): one to three per recording, anywhere from 0.1
 * to 0.45 of the sample rate (a logger's useful band; a resonance above it would be filtered away), damping 2-10 %
 * (lightly damped metal structures; common practice). Their weights are drawn and normalised.
 */
export const RESONANCE_COUNT: [number, number] = [1, 3];
export const RESONANCE_FREQUENCY_FRACTION: [number, number] = [0.1, 0.45];
export const RESONANCE_DAMPING_RATIO: [number, number] = [0.02, 0.1];
/**
 * Modal mass of the local modes at a bearing (housing wall, pedestal), for impacts that strike them directly: a
 * share of a housing of some tens of kg (assumed; with LOAD_MOMENTUM_SHARE in bearing-impacts.ts it sets the
 * scale of the impact ringing).
 */
export const LOCAL_MODAL_MASS_KG: [number, number] = [20, 80];
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
/**
 * A loose housing sits on its pedestal or frame through a steel-on-steel joint: the contact is stiff (the housing
 * mass on it rings at a few hundred Hz; assumed), and the bolt head that stops a lift-off is stiffer still (2-5 ×,
 * assumed). The foundation's own mount is left out in that case: the joint, not the springs, clips the response.
 */
export const LOOSE_CONTACT_FREQUENCY_HZ: [number, number] = [300, 800];
export const LOOSE_BOLT_STIFFNESS_RATIO: [number, number] = [2, 5];
/** Longest run-in before the record starts, s (transients of the mount and the drive die out meanwhile). */
export const MAX_RUN_IN_S = 1.5;

function checkPlan(plan: SynthesisPlan): void {
  const { machine } = plan;
  const point = findPoint(machine, plan.pointId);
  if (point.quantity !== 'acceleration') throw new RangeError(`point ${plan.pointId} must be an acceleration point`);
  pointBearing(machine, plan.pointId);
  const { minRpm = machine.model.speed.nominalRpm, maxRpm = machine.model.speed.nominalRpm } = machine.model.speed;
  if (!(plan.speedRpm >= minRpm * 0.999 && plan.speedRpm <= maxRpm * 1.001)) throw new RangeError(`speedRpm (${plan.speedRpm}) must lie in the model's range ${minRpm}-${maxRpm}`);
  if (!(plan.sampleRateHz >= 1000)) throw new RangeError(`sampleRateHz (${plan.sampleRateHz}) must be >= 1000`);
  if (!(plan.durationS > 0)) throw new RangeError(`durationS (${plan.durationS}) must be > 0`);
  if (!(plan.noise.rmsG >= 0) || !(plan.backgroundRmsG >= 0)) throw new RangeError('noise.rmsG and backgroundRmsG must be >= 0');
}

/** Synthesises one recording of a rig machine at one point. Pure and deterministic for a plan. */
export function synthesizeRecording(plan: SynthesisPlan): SynthesisResult {
  checkPlan(plan);
  const { machine, pointId, faults } = plan;
  const model = machine.model;
  const random = createRandom(plan.seed);
  const draws: Record<string, number | string> = {};
  const faultSizes: Array<FaultSize | undefined> = faults.map(() => undefined);

  // --- Speeds and load -------------------------------------------------------------------------
  const beltSlip = machine.beltSlipPercentRange ? random.between(...machine.beltSlipPercentRange) : 0;
  if (machine.beltSlipPercentRange) draws.beltSlipPercent = beltSlip;
  const speedsHz = shaftSpeedsHz(machine, plan.speedRpm, beltSlip);
  const maxRpm = model.speed.maxRpm ?? model.speed.nominalRpm;
  const minRpm = model.speed.minRpm ?? model.speed.nominalRpm;
  const ratedOmega = (model.speed.nominalRpm * 2 * Math.PI) / 60;
  const ratedTorque = (machine.drive.ratedPowerKw * 1000) / ratedOmega;
  const loadFraction = random.between(...machine.drive.loadFractionRange);
  draws.loadFraction = loadFraction;
  const speedRatio = plan.speedRpm / maxRpm;
  // Fan loads follow the affinity law, torque ∝ speed² (common practice); the others hold their torque.
  const motorTorque = ratedTorque * loadFraction * (machine.drive.loadLaw === 'fan' ? speedRatio * speedRatio : 1);
  const motorShaft = model.motor?.shaft ?? model.speed.shaft;
  const motorOmega = 2 * Math.PI * speedsHz[motorShaft]!;
  const poles = model.motor?.poles ?? 4;
  // Supply frequency of the motor (a variable-speed drive sets it): f = (p/2)·f_rotor/(1 − s) at the running slip.
  const runningSlip = machine.drive.ratedSlip * (motorTorque / ratedTorque);
  const supplyHz = ((poles / 2) * speedsHz[motorShaft]!) / (1 - runningSlip);

  // --- Grid --------------------------------------------------------------------------------------
  const fs = plan.sampleRateHz;
  const outputCount = Math.max(1, Math.round(plan.durationS * fs));
  const foundation = model.iso?.foundation ?? 'rigid';
  const referenceHz = foundation === 'rigid' ? maxRpm / 60 : minRpm / 60;
  const mount: MountSpec = {
    housingMassKg: machine.pointHousingMassKg[pointId] ?? 100,
    // ISO 10816-3 calls a foundation rigid when the lowest natural frequency of machine and foundation is at least
    // 25 % above the running speed, flexible otherwise (from memory); the mount is drawn on the matching side.
    frequencyHz: referenceHz * random.between(...MOUNT_FREQUENCY_RATIO[foundation]),
    dampingRatio: random.between(...MOUNT_DAMPING_RATIO),
  };
  draws.mountFrequencyHz = mount.frequencyHz;
  draws.mountDampingRatio = mount.dampingRatio;

  let gearRun: ReturnType<typeof simulateGearTrain> | null = null;
  let factor = 2; // at least twice the output rate, so that the anti-alias filter has something to remove
  let assembled: ReturnType<typeof assembleGearTrain> | null = null;
  if (machine.gearStages.length > 0) {
    const outputOmega = 2 * Math.PI * speedsHz[shaftOfGear(machine, machine.gearStages[machine.gearStages.length - 1]!.wheelId)]!;
    const syncOmega = (2 * Math.PI * supplyHz) / (poles / 2);
    const motorSlope = ratedTorque / (machine.drive.ratedSlip * syncOmega);
    const loadTorque = motorTorque * (motorOmega / outputOmega);
    const loadSlope = machine.drive.loadLaw === 'fan' ? (2 * loadTorque) / outputOmega : 0;
    assembled = assembleGearTrain(machine, { inputSpeedRadPerS: motorOmega, motorTorqueNm: motorTorque, motorTorqueSlopeNmsPerRad: motorSlope, loadTorqueSlopeNmsPerRad: loadSlope }, faults, random.fork('gears'));
    for (const [i, size] of assembled.faultSizes) faultSizes[i] = size;
    const maxStep = gearTrainStepS(assembled.spec);
    factor = Math.max(2, Math.ceil(1 / (maxStep * fs)));
  }
  const stepS = 1 / (factor * fs);
  const half = (TAPS_PER_FACTOR * factor) / 2;
  const runInS = Math.min(MAX_RUN_IN_S, Math.max(0.05, 4 / (2 * Math.PI * mount.frequencyHz * mount.dampingRatio)));
  const preCount = Math.ceil(runInS / stepS) + half;
  const internalCount = preCount + (outputCount - 1) * factor + 1 + half;
  const startS = -preCount * stepS;
  draws.internalRateHz = factor * fs;
  draws.runInS = preCount * stepS;

  // --- Forces at the point -----------------------------------------------------------------------
  const axial = isAxial(machine, pointId);
  const radialShare = axial ? CROSS_AXIS_SHARE : 1;
  const force = new Float64Array(internalCount);
  const pointShaft = pointBearing(machine, pointId).shaft;

  if (assembled !== null) {
    gearRun = simulateGearTrain(assembled.spec, stepS, internalCount);
    machine.gearStages.forEach((st, i) => {
      const pinionW = shaftTransmission(machine, pointId, shaftOfGear(machine, st.pinionId)) * radialShare;
      const wheelW = shaftTransmission(machine, pointId, shaftOfGear(machine, st.wheelId)) * radialShare;
      const pinionF = gearRun!.bearingForceN[2 * i]!;
      const wheelF = gearRun!.bearingForceN[2 * i + 1]!;
      for (let k = 0; k < internalCount; k++) force[k] = force[k]! + pinionW * pinionF[k]! + wheelW * wheelF[k]!;
      if (axial) {
        // Helical teeth push axially with tan βb of the transverse force, on both gears of the stage.
        const tanB = Math.tan(assembled!.geometries[i]!.baseHelixAngleRad);
        const w = Math.max(shaftTransmission(machine, pointId, shaftOfGear(machine, st.pinionId)), shaftTransmission(machine, pointId, shaftOfGear(machine, st.wheelId)));
        const mf = gearRun!.meshForceN[i]!;
        if (tanB > 0) for (let k = 0; k < internalCount; k++) force[k] = force[k]! + w * tanB * mf[k]!;
      }
    });
  }

  // Shaft harmonics: residual or faulty unbalance and misalignment on every shaft, blade pass, magnetic pull.
  const oneTimesAtPoint: number[] = [];
  for (const shaft of model.shafts) {
    const data = machine.shafts[shaft.id];
    if (data === undefined) throw new RangeError(`${model.id}: shaft ${shaft.id} has no rig data`);
    const fHz = speedsHz[shaft.id]!;
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
    const shaftMaxOmega = 2 * Math.PI * fHz * (maxRpm / plan.speedRpm);
    const U = unbalanceKgM(data.rotorMassKg, grade, shaftMaxOmega);
    const harmonics: Harmonic[] = unbalanceHarmonics(U, fHz, random.between(0, 2 * Math.PI)).map((h) => ({ ...h, amplitudeN: h.amplitudeN * w * radialShare }));
    if (shaft.id === pointShaft) oneTimesAtPoint.push(harmonics[0]!.amplitudeN);
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
      for (const h of mis.radial) harmonics.push({ ...h, amplitudeN: h.amplitudeN * w * radialShare });
      if (axial) for (const h of mis.axial) harmonics.push({ ...h, amplitudeN: h.amplitudeN * w });
    }
    if (machine.bladePass !== undefined && rotorIds.includes(machine.bladePass.rotorId)) {
      const blades = model.rotors.find((r) => r.id === machine.bladePass!.rotorId)!.blades;
      const scale = (plan.speedRpm / maxRpm) ** 2;
      harmonics.push({ order: blades, amplitudeN: machine.bladePass.forceAtMaxSpeedN * scale * w * radialShare, phaseRad: random.between(0, 2 * Math.PI) });
      harmonics.push({ order: 2 * blades, amplitudeN: 0.3 * machine.bladePass.forceAtMaxSpeedN * scale * w * radialShare, phaseRad: random.between(0, 2 * Math.PI) });
    }
    if (shaft.id === motorShaft) {
      // Radial magnetic pull at twice the supply frequency, written as an order of this shaft.
      const wm = casingTransmission(machine, pointId, machine.drive.motorCasing);
      harmonics.push({ order: (2 * supplyHz) / fHz, amplitudeN: machine.drive.magneticForceN * wm * radialShare, phaseRad: random.between(0, 2 * Math.PI) });
    }
    harmonicForce(harmonics, fHz, startS, stepS, internalCount, force);
  }

  // --- Bearing impacts ---------------------------------------------------------------------------
  const impulseTimes: number[] = [];
  const impulseSizes: number[] = [];
  const impactRandom = random.fork('bearings');
  faults.forEach((f, fi) => {
    if (!isBearingFault(f.fault)) return;
    const bearing = model.bearings.find((b) => b.id === f.component);
    const data = machine.bearings[f.component];
    if (bearing === undefined || data === undefined) throw new RangeError(`${model.id}: bearing ${f.component} is unknown to the rig`);
    const range = FAULT_SIZE_RANGES[f.fault];
    const spallMm = impactRandom.between(...range[f.severity]);
    faultSizes[fi] = { quantity: range.quantity, value: spallMm, unit: range.unit };
    const radialLoadN = data.weightLoadN + data.transmissionShare * transmissionForceN(machine, data.transmissionElement, motorTorque, assembled?.geometries ?? []);
    const kind: BearingDefectKind = f.fault === 'bearing-outer-race' ? 'outer-race' : f.fault === 'bearing-inner-race' ? 'inner-race' : 'rolling-element';
    const train = bearingImpacts(
      {
        kind,
        geometry: bearing,
        shaftSpeedHz: speedsHz[bearing.shaft]!,
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
      startS + internalCount * stepS,
      impactRandom,
    );
    const w = bearingTransmission(machine, pointId, bearing.id) * radialShare;
    for (let i = 0; i < train.timeS.length; i++) {
      impulseTimes.push(train.timeS[i]!);
      impulseSizes.push(train.impulseNs[i]! * w);
    }
  });
  const order = impulseTimes.map((_, i) => i).sort((a, b) => impulseTimes[a]! - impulseTimes[b]!);
  const impulses: ImpulseTrain = { timeS: Float64Array.from(order.map((i) => impulseTimes[i]!)), impulseNs: Float64Array.from(order.map((i) => impulseSizes[i]!)) };

  // --- Housing on its mount (linear, or loose) ---------------------------------------------------
  const loosenessFault = faults.findIndex((f) => f.fault === 'looseness' && f.component === pointShaft);
  let housingAcceleration: Float64Array;
  if (loosenessFault >= 0) {
    const severity = faults[loosenessFault]!.severity;
    const range = FAULT_SIZE_RANGES.looseness;
    const gapMm = random.between(...range[severity]);
    faultSizes[loosenessFault] = { quantity: range.quantity, value: gapMm, unit: range.unit };
    const oneTimes = oneTimesAtPoint.reduce((s, x) => s + x, 0);
    const holdingForceN = oneTimes * random.between(...LOOSENESS_HOLDING_FRACTION[severity]);
    const contactHz = random.between(...LOOSE_CONTACT_FREQUENCY_HZ);
    const contactStiffness = mount.housingMassKg * (2 * Math.PI * contactHz) ** 2;
    const boltStiffness = contactStiffness * random.between(...LOOSE_BOLT_STIFFNESS_RATIO);
    draws.looseContactHz = contactHz;
    // The steady part of the bearing force only shifts the rest position; what clamps the housing is W.
    let mean = 0;
    for (let k = 0; k < internalCount; k++) mean += force[k]!;
    mean /= internalCount;
    for (let k = 0; k < internalCount; k++) force[k] = force[k]! - mean;
    housingAcceleration = looseSupportAcceleration(force, stepS, startS, {
      housingMassKg: mount.housingMassKg,
      contactStiffnessNPerM: contactStiffness,
      contactDampingNsPerM: 2 * mount.dampingRatio * Math.sqrt(contactStiffness * mount.housingMassKg),
      boltStiffnessNPerM: boltStiffness,
      boltDampingNsPerM: 2 * mount.dampingRatio * Math.sqrt(boltStiffness * mount.housingMassKg),
      gapM: gapMm / 1000,
      holdingForceN,
    }, impulses);
    draws.looseHoldingForceN = holdingForceN;
  } else {
    housingAcceleration = mountAcceleration(force, stepS, startS, mount, impulses);
  }

  // --- Local resonances, background, anti-alias, noise -------------------------------------------
  const resonanceCount = random.integer(...RESONANCE_COUNT);
  const weights = Array.from({ length: resonanceCount }, () => random.between(0.2, 1));
  const weightSum = weights.reduce((s, x) => s + x, 0);
  const resonances: Resonance[] = weights.map((w, i) => {
    const r = {
      frequencyHz: fs * random.between(...RESONANCE_FREQUENCY_FRACTION),
      dampingRatio: random.between(...RESONANCE_DAMPING_RATIO),
      weight: w / weightSum,
    };
    draws[`resonance${i + 1}Hz`] = r.frequencyHz;
    draws[`resonance${i + 1}DampingRatio`] = r.dampingRatio;
    return r;
  });
  // An impact strikes the housing wall itself: it rings each local mode as a force on that mode's own modal mass
  // (ringing amplitude I·ω/m), while the housing as a whole only takes the velocity step I/M (added above).
  const localModalMassKg = random.between(...LOCAL_MODAL_MASS_KG);
  draws.localModalMassKg = localModalMassKg;
  const sensorAcceleration = resonanceResponse(housingAcceleration, stepS, startS, resonances, diracAreas(impulses, localModalMassKg));

  if (plan.backgroundRmsG > 0) {
    const bgRandom = random.fork('background');
    const white = new Float64Array(internalCount);
    for (let k = 0; k < internalCount; k++) white[k] = bgRandom.normal();
    const background = resonanceResponse(white, stepS, startS, resonances);
    let ss = 0;
    for (let k = preCount; k < internalCount; k++) ss += background[k]! * background[k]!;
    const scale = (plan.backgroundRmsG * STANDARD_GRAVITY) / Math.sqrt(ss / (internalCount - preCount));
    for (let k = 0; k < internalCount; k++) sensorAcceleration[k] = sensorAcceleration[k]! + scale * background[k]!;
  }

  const decimated = decimate(sensorAcceleration, factor, preCount, outputCount);
  const noise = sensorNoise(random.fork('sensor'), outputCount, fs, plan.noise.rmsG, plan.noise.colour);
  const samples = new Float64Array(outputCount);
  for (let m = 0; m < outputCount; m++) samples[m] = decimated[m]! / STANDARD_GRAVITY + noise[m]!;

  for (let i = 0; i < faults.length; i++) {
    if (faultSizes[i] === undefined) throw new RangeError(`fault ${faults[i]!.fault} at ${faults[i]!.component} does not fit ${model.id} at point ${pointId}`);
  }
  const point = findPoint(machine, pointId);
  return {
    recording: {
      sampleRateHz: fs,
      channels: [{ name: pointId, unit: point.unit ?? 'g', samples }],
      metadata: {
        source: '@kinespec/lumped-rig',
        machine: model.id,
        point: pointId,
        sampleRateHz: String(fs),
        durationS: String(outputCount / fs),
        seed: String(plan.seed),
      },
    },
    shaftSpeedsRpm: Object.fromEntries(Object.entries(speedsHz).map(([id, hz]) => [id, hz * 60])),
    faultSizes: faultSizes as FaultSize[],
    draws,
  };
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
