import { assembleGearTrain } from './gear-train-assembly.js';
import { gearTrainStepS } from './gear-train.js';
import type { MachineModelDocument } from './machine-model-document.js';
import { createRandom, deriveSeed, type Random } from './random.js';
import { synthesizeRecording, type RigRecording } from './recording-synthesis.js';
import { pointBearing, shaftOfGear, type RigMachine } from './rig-machine.js';
import { rigMachines } from './rig-machines.js';
import type { FaultSize, RigFault, RigFaultKind, RigSeverity } from './rig-faults.js';
import type { NoiseColour } from './sensor-noise.js';

/**
 * The labelled corpus: recordings of the rig's machines, healthy (about a quarter) or with one fault (some with
 * two), each at a random speed, sample rate, duration, path and noise that the analysis is not told.
 */
export interface CorpusOptions {
  seed: number;
  /** Number of cases; default FULL_COUNT, or QUICK_COUNT when `quick`. */
  count?: number;
  /** A small, short set for CI: QUICK_COUNT cases at QUICK_SAMPLE_RATES_HZ over QUICK_DURATION_RANGE_S. */
  quick?: boolean;
}

export interface CorpusLabel {
  /** Faults built into the recording; empty for a healthy machine. */
  faults: Array<{ fault: RigFaultKind; component: string; severity: RigSeverity; size: FaultSize }>;
  /** True mean speed of the model's reference shaft, rpm. */
  speedRpm: number;
  /** True speed of every shaft, rpm (a belt's true slip differs from the model's stated one). */
  shaftSpeedsRpm: Record<string, number>;
  /** The speed is never given to the analysis: it must find it. */
  speedGiven: false;
}

export interface CorpusCase {
  id: string;
  /** The machine-model document (passes @kinespec/kinematics' validateMachineModel). */
  machine: MachineModelDocument;
  pointId: string;
  recording: RigRecording;
  label: CorpusLabel;
  /** Nuisance parameters of the recording (resonances, mount, noise, ...), for reports only. */
  draws: Record<string, number | string>;
}

export const FULL_COUNT = 80;
export const QUICK_COUNT = 12;
/** Output samples per recording at most (about 4 MB of Float64): 96 kHz recordings stop at 5.2 s. */
export const MAX_SAMPLES = 500_000;
/** The quick set keeps to the lower logger rates and to 0.5-1 s, so that CI makes it in a few seconds. */
export const QUICK_SAMPLE_RATES_HZ = [12_800, 20_000, 25_600] as const;
export const QUICK_DURATION_RANGE_S: [number, number] = [0.5, 1];
/**
 * Integration steps per recording at most: gear machines integrate at about 77 kHz whatever the output rate, so
 * this shortens their long, fast recordings (a 96 kHz gear recording stops at 3.6 s) and keeps the full corpus
 * within about a minute on one core.
 */
export const MAX_INTERNAL_STEPS = 700_000;
/** Sample rates of common data loggers (Hz). */
export const SAMPLE_RATES_HZ = [12_800, 20_000, 25_600, 48_000, 51_200, 96_000] as const;
export const DURATION_RANGE_S: [number, number] = [0.5, 10];
/** Share of cases that are healthy, and of faulty cases that carry a second fault. */
export const HEALTHY_SHARE = 0.25;
export const TWO_FAULT_SHARE = 0.2;
/** Share of faulty cases measured at another point of the same casing than the faulty component's own. */
export const NEIGHBOUR_POINT_SHARE = 0.2;
/**
 * Sensor noise, r.m.s. g over the band (log-uniform): a general-purpose 100 mV/g IEPE accelerometer and its logger
 * have a broadband floor of a few tenths of a mg (from memory of data sheets), cables and a poor mount raise it
 * tenfold; pink with this probability. Broadband machine noise (flow, rolling, neighbours) at the sensor through
 * the local resonances, 3-30 mg r.m.s. (assumed; it sets the haystacks under the resonances).
 */
export const SENSOR_NOISE_RMS_G: [number, number] = [3e-4, 3e-3];
export const PINK_NOISE_SHARE = 0.4;
export const BACKGROUND_RMS_G: [number, number] = [3e-3, 3e-2];

/** Fault kinds in the order the corpus cycles through them (gear kinds only on machines with gears). */
const KIND_CYCLE: readonly RigFaultKind[] = [
  'bearing-outer-race',
  'gear-missing-tooth',
  'unbalance',
  'bearing-inner-race',
  'gear-broken-tooth',
  'misalignment',
  'bearing-rolling-element',
  'looseness',
  'gear-eccentricity',
  'gear-wear',
];

type Family = 'shaft' | 'gear' | 'bearing';
function familyOf(kind: RigFaultKind): Family {
  if (kind.startsWith('gear-')) return 'gear';
  if (kind.startsWith('bearing-')) return 'bearing';
  return 'shaft';
}

interface FaultOption {
  machine: RigMachine;
  fault: RigFaultKind;
  component: string;
  /** Shaft the component sits on (a mesh: its pinion's). */
  shaft: string;
  /** Points that show it best, own first. */
  points: string[];
}

function shaftPoints(machine: RigMachine, shaft: string): string[] {
  return machine.model.points.filter((p) => p.quantity === 'acceleration' && pointBearing(machine, p.id).shaft === shaft).map((p) => p.id);
}

function casingPoints(machine: RigMachine, shaft: string): string[] {
  const casing = machine.shafts[shaft]!.casing;
  return machine.model.points.filter((p) => p.quantity === 'acceleration' && machine.shafts[pointBearing(machine, p.id).shaft]!.casing === casing).map((p) => p.id);
}

/** Every fault each machine can carry, with the points that see it. */
export function faultOptions(machines: readonly RigMachine[] = rigMachines): FaultOption[] {
  const out: FaultOption[] = [];
  for (const machine of machines) {
    const add = (fault: RigFaultKind, component: string, shaft: string, own: string[]) => {
      const points = [...new Set([...own, ...casingPoints(machine, shaft)])];
      if (points.length > 0) out.push({ machine, fault, component, shaft, points });
    };
    for (const st of machine.gearStages) {
      for (const gear of [st.pinionId, st.wheelId]) {
        const shaft = shaftOfGear(machine, gear);
        const own = shaftPoints(machine, shaft).filter((p) => machine.model.points.find((x) => x.id === p)!.direction !== 'axial');
        for (const fault of ['gear-missing-tooth', 'gear-broken-tooth', 'gear-eccentricity'] as const) add(fault, gear, shaft, own);
      }
      const shaft = shaftOfGear(machine, st.pinionId);
      add('gear-wear', st.meshId, shaft, shaftPoints(machine, shaft));
    }
    for (const b of machine.model.bearings) {
      const own = machine.model.points.filter((p) => p.near === b.id).map((p) => p.id);
      for (const fault of ['bearing-outer-race', 'bearing-inner-race', 'bearing-rolling-element'] as const) add(fault, b.id, b.shaft, [...own, ...shaftPoints(machine, b.shaft)]);
    }
    for (const s of machine.model.shafts) {
      const radial = shaftPoints(machine, s.id).filter((p) => machine.model.points.find((x) => x.id === p)!.direction !== 'axial');
      const rotor = machine.model.rotors.find((r) => r.shaft === s.id);
      add('unbalance', rotor?.id ?? s.id, s.id, radial);
      if (machine.couplings.some((c) => c.shaft === s.id)) add('misalignment', s.id, s.id, shaftPoints(machine, s.id));
      // A loose hold-down shows at its own housing only.
      if (radial.length > 0) out.push({ machine, fault: 'looseness', component: s.id, shaft: s.id, points: radial });
    }
  }
  return out;
}

/** Integration rate (Hz) a machine's gear train needs (0 without gears): independent of the random draws. */
function requiredInternalRateHz(machine: RigMachine): number {
  if (machine.gearStages.length === 0) return 0;
  const speed = (machine.model.speed.nominalRpm * 2 * Math.PI) / 60;
  const { spec } = assembleGearTrain(machine, { inputSpeedRadPerS: speed, motorTorqueNm: 1, motorTorqueSlopeNmsPerRad: 1, loadTorqueSlopeNmsPerRad: 0 }, [], createRandom(0));
  return 1 / gearTrainStepS(spec);
}

interface CasePlan {
  index: number;
  machine: RigMachine;
  pointId: string;
  faults: RigFault[];
}

function planCases(count: number, random: Random): CasePlan[] {
  const options = faultOptions();
  const plans: CasePlan[] = [];
  let cycle = 0;
  const healthyEvery = Math.round(1 / HEALTHY_SHARE);
  for (let index = 0; index < count; index++) {
    if (index % healthyEvery === 0) {
      const machine = rigMachines[(index / healthyEvery) % rigMachines.length]!;
      const points = machine.model.points.filter((p) => p.quantity === 'acceleration');
      plans.push({ index, machine, pointId: random.pick(points).id, faults: [] });
      continue;
    }
    const kind = KIND_CYCLE[cycle % KIND_CYCLE.length]!;
    cycle++;
    const option = random.pick(options.filter((o) => o.fault === kind));
    const severity: RigSeverity = random.uniform() < 0.5 ? 'shallow' : 'clear';
    const neighbour = option.fault !== 'looseness' && option.points.length > 1 && random.uniform() < NEIGHBOUR_POINT_SHARE;
    const pointId = neighbour ? random.pick(option.points.slice(1)) : option.points[0]!;
    const faults: RigFault[] = [{ fault: option.fault, component: option.component, severity }];
    if (random.uniform() < TWO_FAULT_SHARE) {
      const seconds = options.filter((o) => o.machine === option.machine && familyOf(o.fault) !== familyOf(option.fault) && o.points.includes(pointId) && (o.fault !== 'looseness' || o.points[0] === pointId));
      if (seconds.length > 0) {
        const second = random.pick(seconds);
        faults.push({ fault: second.fault, component: second.component, severity: random.uniform() < 0.5 ? 'shallow' : 'clear' });
      }
    }
    plans.push({ index, machine: option.machine, pointId, faults });
  }
  return plans;
}

/** Everything drawn for one case before synthesis: cheap to list, so a corpus can be inspected before it is made. */
export interface CorpusCasePlan {
  id: string;
  machine: RigMachine;
  pointId: string;
  faults: RigFault[];
  speedRpm: number;
  sampleRateHz: number;
  durationS: number;
  noise: { rmsG: number; colour: NoiseColour };
  backgroundRmsG: number;
  /** Seed of the recording's own draws (path, mount, manufacturing deviations, impacts, noise). */
  seed: number;
}

/** The plan of every case of a corpus, in order. Deterministic for a seed. */
export function corpusPlan(options: CorpusOptions): CorpusCasePlan[] {
  const { seed } = options;
  if (!Number.isFinite(seed)) throw new RangeError(`seed (${seed}) must be a finite number`);
  const quick = options.quick === true;
  const count = options.count ?? (quick ? QUICK_COUNT : FULL_COUNT);
  if (!(Number.isInteger(count) && count >= 1)) throw new RangeError(`count (${count}) must be a whole number >= 1`);
  const random = createRandom(seed);
  const rates = new Map<RigMachine, number>(rigMachines.map((m) => [m, requiredInternalRateHz(m)]));
  return planCases(count, random.fork('plan')).map((plan) => {
    const r = createRandom(deriveSeed(seed, `case-${plan.index}`));
    const { minRpm = plan.machine.model.speed.nominalRpm, maxRpm = plan.machine.model.speed.nominalRpm } = plan.machine.model.speed;
    const speedRpm = r.between(minRpm, maxRpm);
    const sampleRateHz = r.pick(quick ? QUICK_SAMPLE_RATES_HZ : SAMPLE_RATES_HZ);
    const factor = Math.max(2, Math.ceil(rates.get(plan.machine)! / sampleRateHz));
    const maxSamples = Math.min(MAX_SAMPLES, Math.floor(MAX_INTERNAL_STEPS / factor));
    const drawnS = r.logBetween(...(quick ? QUICK_DURATION_RANGE_S : DURATION_RANGE_S));
    const durationS = Math.round(sampleRateHz * Math.min(drawnS, maxSamples / sampleRateHz)) / sampleRateHz;
    const colour: NoiseColour = r.uniform() < PINK_NOISE_SHARE ? 'pink' : 'white';
    return {
      id: `lumped-rig/s${seed}/${String(plan.index).padStart(3, '0')}`,
      machine: plan.machine,
      pointId: plan.pointId,
      faults: plan.faults,
      speedRpm,
      sampleRateHz,
      durationS,
      noise: { rmsG: r.logBetween(...SENSOR_NOISE_RMS_G), colour },
      backgroundRmsG: r.logBetween(...BACKGROUND_RMS_G),
      seed: deriveSeed(seed, `synthesis-${plan.index}`),
    };
  });
}

/** Synthesises one planned case. */
export function synthesizeCase(plan: CorpusCasePlan): CorpusCase {
  const result = synthesizeRecording(plan);
  return {
    id: plan.id,
    machine: structuredClone(plan.machine.model),
    pointId: plan.pointId,
    recording: result.recording,
    label: {
      faults: plan.faults.map((f, i) => ({ ...f, size: result.faultSizes[i]! })),
      speedRpm: plan.speedRpm,
      shaftSpeedsRpm: result.shaftSpeedsRpm,
      speedGiven: false,
    },
    draws: { ...result.draws, sensorNoiseRmsG: plan.noise.rmsG, sensorNoiseColour: plan.noise.colour, backgroundRmsG: plan.backgroundRmsG },
  };
}

/** The corpus one case at a time (a full corpus holds some 80 MB of samples; an evaluation can stream it). */
export function* corpusCases(options: CorpusOptions): Generator<CorpusCase> {
  for (const plan of corpusPlan(options)) yield synthesizeCase(plan);
}

/** The whole corpus at once. Deterministic for a seed. */
export function generateCorpus(options: CorpusOptions): CorpusCase[] {
  return [...corpusCases(options)];
}
