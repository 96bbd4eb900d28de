import { decimate, TAPS_PER_FACTOR } from './anti-alias-decimator.js';
import { bearingFaultImpulses } from './bearing-fault-impulses.js';
import { looseSupportAcceleration } from './loose-support.js';
import { addGearForces, addShaftHarmonics, gearTrainFor } from './point-forces.js';
import { createRandom } from './random.js';
import { findPoint, pointBearing, type RigMachine } from './rig-machine.js';
import { FAULT_SIZE_RANGES, LOOSENESS_HOLDING_FRACTION, type FaultSize, type RigFault } from './rig-faults.js';
import { sensorNoise, type NoiseColour } from './sensor-noise.js';
import { diracAreas, mountAcceleration, resonanceResponse, type ImpulseTrain, type MountSpec, type Resonance } from './structural-path.js';
import { drivePoint, type Grid, type SynthesisContext } from './synthesis-context.js';

/**
 * One recording, stage by stage: the drive's running point; the gear train integrated in time; the forces at the
 * point's housing (gear bearing forces, shaft harmonics) and the bearing impacts; the housing on its mount (or
 * loose); the local resonances and the broadband machine noise; the logger's anti-alias filter; the sensor noise.
 */

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
  const random = createRandom(plan.seed);
  const draws: Record<string, number | string> = {};
  const drive = drivePoint(machine, plan.speedRpm, random, draws);
  const mount = drawMount(machine, pointId, drive.minRpm, drive.maxRpm, random, draws);
  const { assembled, factor } = gearTrainFor(machine, drive, faults, random.fork('gears'), plan.sampleRateHz);
  const outputCount = Math.max(1, Math.round(plan.durationS * plan.sampleRateHz));
  const grid = makeGrid(plan.sampleRateHz, factor, outputCount, mount);
  draws.internalRateHz = factor * plan.sampleRateHz;
  draws.runInS = grid.preCount * grid.stepS;
  const ctx: SynthesisContext = { machine, pointId, faults, random, draws, faultSizes: faults.map(() => undefined), drive, grid };
  if (assembled !== null) for (const [i, size] of assembled.faultSizes) ctx.faultSizes[i] = size;

  const force = new Float64Array(grid.count);
  if (assembled !== null) addGearForces(ctx, assembled, force);
  const oneTimesN = addShaftHarmonics(ctx, force);
  const impulses = bearingFaultImpulses(ctx, assembled?.geometries ?? []);
  const housing = housingAcceleration(ctx, mount, force, impulses, oneTimesN);
  const samples = sensorChain(ctx, plan, housing, impulses, outputCount);

  faults.forEach((f, i) => {
    if (ctx.faultSizes[i] === undefined) throw new RangeError(`fault ${f.fault} at ${f.component} does not fit ${machine.model.id} at point ${pointId}`);
  });
  const point = findPoint(machine, pointId);
  return {
    recording: {
      sampleRateHz: plan.sampleRateHz,
      channels: [{ name: pointId, unit: point.unit ?? 'g', samples }],
      metadata: {
        source: '@kinespec/lumped-rig',
        machine: machine.model.id,
        point: pointId,
        sampleRateHz: String(plan.sampleRateHz),
        durationS: String(outputCount / plan.sampleRateHz),
        seed: String(plan.seed),
      },
    },
    shaftSpeedsRpm: Object.fromEntries(Object.entries(drive.speedsHz).map(([id, hz]) => [id, hz * 60])),
    faultSizes: ctx.faultSizes as FaultSize[],
    draws,
  };
}

/** The housing's mount at this point, on the side of the running speed its ISO foundation class calls for. */
function drawMount(machine: RigMachine, pointId: string, minRpm: number, maxRpm: number, random: SynthesisContext['random'], draws: SynthesisContext['draws']): MountSpec {
  const foundation = machine.model.iso?.foundation ?? 'rigid';
  const referenceHz = foundation === 'rigid' ? maxRpm / 60 : minRpm / 60;
  const mount: MountSpec = {
    housingMassKg: machine.pointHousingMassKg[pointId] ?? 100,
    frequencyHz: referenceHz * random.between(...MOUNT_FREQUENCY_RATIO[foundation]),
    dampingRatio: random.between(...MOUNT_DAMPING_RATIO),
  };
  draws.mountFrequencyHz = mount.frequencyHz;
  draws.mountDampingRatio = mount.dampingRatio;
  return mount;
}

/**
 * The integration grid: `factor` samples per output sample, a run-in of four time constants of the mount
 * (4/(ζω), at least 0.05 s, at most MAX_RUN_IN_S) and the anti-alias filter's half length on both sides.
 */
function makeGrid(sampleRateHz: number, factor: number, outputCount: number, mount: MountSpec): Grid {
  const stepS = 1 / (factor * sampleRateHz);
  const half = (TAPS_PER_FACTOR * factor) / 2;
  const runInS = Math.min(MAX_RUN_IN_S, Math.max(0.05, 4 / (2 * Math.PI * mount.frequencyHz * mount.dampingRatio)));
  const preCount = Math.ceil(runInS / stepS) + half;
  return { stepS, startS: -preCount * stepS, count: preCount + (outputCount - 1) * factor + 1 + half, preCount, factor };
}

/** The housing's acceleration: on its linear mount, or, with a looseness fault on the point's shaft, loose. */
function housingAcceleration(ctx: SynthesisContext, mount: MountSpec, force: Float64Array, impulses: ImpulseTrain, oneTimesN: number): Float64Array {
  const { faults, random, draws, grid } = ctx;
  const pointShaft = pointBearing(ctx.machine, ctx.pointId).shaft;
  const fault = faults.findIndex((f) => f.fault === 'looseness' && f.component === pointShaft);
  if (fault < 0) return mountAcceleration(force, grid.stepS, grid.startS, mount, impulses);
  const severity = faults[fault]!.severity;
  const range = FAULT_SIZE_RANGES.looseness;
  const gapMm = random.between(...range[severity]);
  ctx.faultSizes[fault] = { quantity: range.quantity, value: gapMm, unit: range.unit };
  const holdingForceN = oneTimesN * random.between(...LOOSENESS_HOLDING_FRACTION[severity]);
  const contactHz = random.between(...LOOSE_CONTACT_FREQUENCY_HZ);
  const contactStiffness = mount.housingMassKg * (2 * Math.PI * contactHz) ** 2;
  const boltStiffness = contactStiffness * random.between(...LOOSE_BOLT_STIFFNESS_RATIO);
  draws.looseContactHz = contactHz;
  draws.looseHoldingForceN = holdingForceN;
  // The steady part of the bearing force only shifts the rest position; what clamps the housing is W.
  let mean = 0;
  for (let k = 0; k < grid.count; k++) mean += force[k]!;
  mean /= grid.count;
  const dynamic = force.map((f) => f - mean);
  return looseSupportAcceleration(dynamic, grid.stepS, grid.startS, {
    housingMassKg: mount.housingMassKg,
    contactStiffnessNPerM: contactStiffness,
    contactDampingNsPerM: 2 * mount.dampingRatio * Math.sqrt(contactStiffness * mount.housingMassKg),
    boltStiffnessNPerM: boltStiffness,
    boltDampingNsPerM: 2 * mount.dampingRatio * Math.sqrt(boltStiffness * mount.housingMassKg),
    gapM: gapMm / 1000,
    holdingForceN,
  }, impulses);
}

/** Local resonances (with the impacts striking them and the broadband machine noise), anti-alias, sensor noise; in g. */
function sensorChain(ctx: SynthesisContext, plan: SynthesisPlan, housing: Float64Array, impulses: ImpulseTrain, outputCount: number): Float64Array {
  const { random, draws, grid } = ctx;
  const fs = plan.sampleRateHz;
  const resonanceCount = random.integer(...RESONANCE_COUNT);
  const weights = Array.from({ length: resonanceCount }, () => random.between(0.2, 1));
  const weightSum = weights.reduce((s, x) => s + x, 0);
  const resonances: Resonance[] = weights.map((w, i) => {
    const r = { frequencyHz: fs * random.between(...RESONANCE_FREQUENCY_FRACTION), dampingRatio: random.between(...RESONANCE_DAMPING_RATIO), weight: w / weightSum };
    draws[`resonance${i + 1}Hz`] = r.frequencyHz;
    draws[`resonance${i + 1}DampingRatio`] = r.dampingRatio;
    return r;
  });
  // An impact strikes the housing wall itself: it rings each local mode as a force on that mode's own modal mass
  // (ringing amplitude I·ω/m), while the housing as a whole only takes the velocity step I/M (in the mount).
  const localModalMassKg = random.between(...LOCAL_MODAL_MASS_KG);
  draws.localModalMassKg = localModalMassKg;
  const sensor = resonanceResponse(housing, grid.stepS, grid.startS, resonances, diracAreas(impulses, localModalMassKg));
  if (plan.backgroundRmsG > 0) {
    // Broadband machine noise: white force noise through the same resonances, scaled to its drawn r.m.s.
    const bgRandom = random.fork('background');
    const white = new Float64Array(grid.count);
    for (let k = 0; k < grid.count; k++) white[k] = bgRandom.normal();
    const background = resonanceResponse(white, grid.stepS, grid.startS, resonances);
    let ss = 0;
    for (let k = grid.preCount; k < grid.count; k++) ss += background[k]! * background[k]!;
    const scale = (plan.backgroundRmsG * STANDARD_GRAVITY) / Math.sqrt(ss / (grid.count - grid.preCount));
    for (let k = 0; k < grid.count; k++) sensor[k] = sensor[k]! + scale * background[k]!;
  }
  const decimated = decimate(sensor, grid.factor, grid.preCount, outputCount);
  const noise = sensorNoise(random.fork('sensor'), outputCount, fs, plan.noise.rmsG, plan.noise.colour);
  const samples = new Float64Array(outputCount);
  for (let m = 0; m < outputCount; m++) samples[m] = decimated[m]! / STANDARD_GRAVITY + noise[m]!;
  return samples;
}
