import { faultKinds, type Bearing, type FaultKind, type Gear, type GearMesh, type MachineModel, type Point } from '@kinespec/kinematics';
import type { Channel, Recording } from '@kinespec/signal';
import { bearingOrders } from './bearing-orders.js';
import { colouredNoise, type NoiseColour } from './coloured-noise.js';
import { SimulatorInputError } from './errors.js';
import { gaussian, mulberry32, type Uniform } from './prng.js';
import { pulseTrain } from './pulse-train.js';
import { shaftGraph, type ShaftGraph } from './shaft-graph.js';
import { shaftMotion, type SpeedProfile } from './speed-profile.js';
import { addFixedTone, addOrderTone, addRing, timesAtRevolutions, type StructuralResonance, type Synth } from './synth.js';

// The fault names are the machine-model contract's (shared with the predictor); the physics below is the simulator's own.
export { faultKinds, type FaultKind } from '@kinespec/kinematics';

/** A fault to build into the recording; `severity` 0 (absent) to 1 (severe). */
export interface SimulatedFault {
  fault: FaultKind;
  /** Shaft or rotor (unbalance), shaft (misalignment, looseness), gear, gear mesh (wear), bearing, or the motor. */
  component: string;
  severity: number;
}

export interface SimulationOptions {
  /** The measurement point of the model the main channel reads. */
  pointId: string;
  sampleRateHz: number;
  /** Length of the record; give this or `sampleCount`. */
  durationS?: number;
  sampleCount?: number;
  /** Constant speed of the reference shaft (default: the model's nominal speed). */
  speedRpm?: number;
  /** Varying speed of the reference shaft: a ramp [startRpm, endRpm] over the record, or rpm as a function of time (s). */
  speedProfile?: readonly [number, number] | ((tS: number) => number);
  faults?: readonly SimulatedFault[];
  /**
   * Gaussian noise added to the main channel: `rms` in the point's unit, or `accelerationRmsG`
   * for acceleration points (default 0.02 g; 0.01 of the unit for velocity and displacement points).
   * `colour` splits its power between white, pink (1/f) and brown (1/f²) parts (default all white).
   */
  noise?: { accelerationRmsG?: number; rms?: number; seed?: number; colour?: NoiseColour };
  /**
   * Structural resonances the impacts ring, instead of the point's `resonances` (default: the point's, else 3 kHz,
   * ζ = 0.05). `weight` is each mode's share of an impact (default an equal share).
   */
  resonances?: ReadonlyArray<{ frequencyHz: number; dampingRatio: number; weight?: number }>;
  /** Peak acceleration (g) of the healthy mesh tone at 1, 2, 3, … × the mesh frequency (default [0.15, 0.06, 0.025]); scaled by `healthyLevel`. */
  meshHarmonicsG?: readonly number[];
  /**
   * Shape of a missing or broken tooth: `impactScale` multiplies the impact when the next tooth takes the load
   * (default 1: 2 g missing, 1.2 g broken at severity 1); `depthScale` multiplies the drop of the mesh force
   * (default 1: all of it for a missing tooth, half for a broken one, times severity; capped at a full drop);
   * `gateWidthPitches` is how long the force stays low, in tooth pitches (default 1); `gateEdgeFraction` the share
   * of that width taken by each raised-cosine edge (default 0.25; 0 a rectangular gate, 0.5 a Hann-shaped dip).
   */
  toothFault?: { impactScale?: number; depthScale?: number; gateWidthPitches?: number; gateEdgeFraction?: number };
  /**
   * Load zone of inner-race and rolling-element defects: `loadZoneDepth` 1 (default) lets impacts vanish outside
   * the load zone, 0 gives every impact the same strength (no modulation).
   */
  bearingFault?: { loadZoneDepth?: number };
  /** Add a tach channel: once per revolution of the reference shaft unless told otherwise. */
  includeTach?: boolean | { shaft?: string; pulsesPerRev?: number };
  /** Add an encoder channel (50 % square wave) with this many pulses per revolution of the reference shaft, or of `shaft`. */
  includeEncoder?: number | { pulsesPerRev: number; shaft?: string };
  /**
   * Torsional vibration seen by the encoder: the encoder shaft's angle is its rigid-body angle plus
   * Σ amplitudeDeg·sin(order·θ + phaseDeg), orders of the encoder shaft.
   */
  encoderAngleFluctuation?: ReadonlyArray<{ order: number; amplitudeDeg: number; phaseDeg?: number }>;
  /** Scale of the healthy machine's own lines (residual unbalance, mesh tones, blade pass, electrical); 0 removes them. Default 1. */
  healthyLevel?: number;
  /** Random slip of rolling elements, percent of each impact interval (default 1.5; Randall & Antoni 2011 give 1-2 %). */
  bearingSlipPercent?: number;
  /** Seed of every random choice (phases, slip, noise unless `noise.seed`). Default 1. */
  seed?: number;
}

const STANDARD_GRAVITY_MS2 = 9.80665; // CGPM 1901, exact

/** From SI (m/s², m/s, m) to each unit a point may use. */
const UNIT_FROM_SI: Record<string, { quantity: 'acceleration' | 'velocity' | 'displacement'; factor: number }> = {
  g: { quantity: 'acceleration', factor: 1 / STANDARD_GRAVITY_MS2 },
  'm/s^2': { quantity: 'acceleration', factor: 1 },
  'mm/s^2': { quantity: 'acceleration', factor: 1e3 },
  'mm/s': { quantity: 'velocity', factor: 1e3 },
  'm/s': { quantity: 'velocity', factor: 1 },
  'in/s': { quantity: 'velocity', factor: 1 / 0.0254 },
  um: { quantity: 'displacement', factor: 1e6 },
  mm: { quantity: 'displacement', factor: 1e3 },
  m: { quantity: 'displacement', factor: 1 },
  mil: { quantity: 'displacement', factor: 1 / 2.54e-5 },
};
const DEFAULT_UNIT = { acceleration: 'g', velocity: 'mm/s', displacement: 'um' } as const;

/** Default structural resonance when the point and the options name none. */
const DEFAULT_RESONANCE = { frequencyHz: 3000, dampingRatio: 0.05 };

/**
 * Synthesises a recording of one point of a machine from time-domain physics: each shaft's angle is
 * the integral of the speed profile times its ratio, every component is a function of a shaft angle
 * (so orders stay fixed when speed varies), impacts ring the point's structural resonances, and white
 * Gaussian noise from a seeded generator is added. Deterministic for a given seed. Amplitudes are
 * plausible magnitudes for a machine in service, not a calibrated model of any one machine.
 */
export function simulateRecording(model: MachineModel, options: SimulationOptions): Recording {
  const { sampleRateHz, pointId } = options;
  if (!Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    throw new SimulatorInputError('invalid_sample_rate', `sampleRateHz (${sampleRateHz}) must be a number > 0`);
  }
  const sampleCount = options.sampleCount ?? Math.round((options.durationS ?? Number.NaN) * sampleRateHz);
  if (!Number.isInteger(sampleCount) || sampleCount < 2) {
    throw new SimulatorInputError('invalid_length', `give durationS or sampleCount for at least 2 samples (got ${options.sampleCount ?? options.durationS})`);
  }
  const point = model.points.find((p) => p.id === pointId);
  if (!point) throw new SimulatorInputError('unknown_point', `pointId '${pointId}' is not a point of machine '${model.id}'`);
  const seed = options.seed ?? 1;
  const graph = shaftGraph(model);
  const profile: SpeedProfile = options.speedProfile ?? options.speedRpm ?? model.speed.nominalRpm;
  const motion = shaftMotion(profile, sampleRateHz, sampleCount);

  const channels: Channel[] = [];
  const metadata: Record<string, string> = {
    source: 'kinespec simulator',
    machineId: model.id,
    pointId,
    seed: String(seed),
    faults: JSON.stringify(options.faults ?? []),
  };
  let meanHz = 0;
  for (let i = 0; i < sampleCount; i++) meanHz += motion.speedHz[i]!;
  meanHz /= sampleCount;
  metadata.meanSpeedRpm = (meanHz * 60).toFixed(3);
  const range = minMax(motion.speedHz);
  metadata.minSpeedRpm = (range.min * 60).toFixed(3);
  metadata.maxSpeedRpm = (range.max * 60).toFixed(3);

  if (point.quantity === 'tach' || point.quantity === 'encoder') {
    const shaft = point.shaft ?? model.speed.shaft;
    const ppr = point.pulsesPerRev ?? (point.quantity === 'tach' ? 1 : Number.NaN);
    if (!Number.isInteger(ppr)) throw new SimulatorInputError('pulses_per_rev', `point '${pointId}' is an encoder without pulsesPerRev`);
    const fluctuation = point.quantity === 'encoder' ? options.encoderAngleFluctuation : undefined;
    channels.push(pulseChannel(pointId, point.quantity, motion, graph.ratio(shaft), ppr, sampleRateHz, seed + 101, fluctuation));
  } else {
    channels.push(vibrationChannel(model, point, options, motion, graph, meanHz, seed));
  }

  if (options.includeTach) {
    const spec = options.includeTach === true ? {} : options.includeTach;
    const shaft = spec.shaft ?? model.speed.shaft;
    metadata.tachChannel = String(channels.length);
    metadata.tachShaft = shaft;
    metadata.tachPulsesPerRev = String(spec.pulsesPerRev ?? 1);
    channels.push(pulseChannel('tach', 'tach', motion, graph.ratio(shaft), spec.pulsesPerRev ?? 1, sampleRateHz, seed + 202));
  }
  if (options.includeEncoder !== undefined) {
    const spec = typeof options.includeEncoder === 'number' ? { pulsesPerRev: options.includeEncoder } : options.includeEncoder;
    const shaft = spec.shaft ?? model.speed.shaft;
    metadata.encoderChannel = String(channels.length);
    metadata.encoderShaft = shaft;
    metadata.encoderPulsesPerRev = String(spec.pulsesPerRev);
    channels.push(
      pulseChannel('encoder', 'encoder', motion, graph.ratio(shaft), spec.pulsesPerRev, sampleRateHz, seed + 303, options.encoderAngleFluctuation),
    );
  }
  return { sampleRateHz, channels, metadata };
}

function minMax(x: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (const v of x) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

function pulseChannel(
  name: string,
  quantity: 'tach' | 'encoder',
  motion: { revolutions: Float64Array; speedHz: Float64Array },
  ratio: number,
  pulsesPerRev: number,
  sampleRateHz: number,
  seed: number,
  fluctuation?: SimulationOptions['encoderAngleFluctuation'],
): Channel {
  if (!Number.isInteger(pulsesPerRev) || pulsesPerRev < 1) {
    throw new SimulatorInputError('pulses_per_rev', `pulsesPerRev (${pulsesPerRev}) must be a whole number >= 1`);
  }
  const n = motion.revolutions.length;
  const revs = new Float64Array(n);
  const speedHz = new Float64Array(n);
  let maxPulseHz = 0;
  for (let i = 0; i < n; i++) {
    let r = motion.revolutions[i]! * ratio;
    let f = motion.speedHz[i]! * ratio;
    for (const c of fluctuation ?? []) {
      const phase = 2 * Math.PI * c.order * r + ((c.phaseDeg ?? 0) * Math.PI) / 180;
      r += (c.amplitudeDeg / 360) * Math.sin(phase);
      f += (c.amplitudeDeg / 360) * 2 * Math.PI * c.order * f * Math.cos(phase);
    }
    revs[i] = r;
    speedHz[i] = f;
    if (f * pulsesPerRev > maxPulseHz) maxPulseHz = f * pulsesPerRev;
  }
  // Each half period needs a few samples to be seen at all.
  if (quantity === 'encoder' && maxPulseHz > sampleRateHz / 8) {
    throw new SimulatorInputError(
      'pulses_per_rev',
      `an encoder of ${pulsesPerRev} pulses/rev reaches ${maxPulseHz.toFixed(0)} pulses/s, more than sampleRateHz/8 (${(sampleRateHz / 8).toFixed(0)}); use fewer pulses per rev or a higher sample rate`,
    );
  }
  const samples = pulseTrain(revs, speedHz, {
    pulsesPerRev,
    dutyFraction: quantity === 'tach' ? 0.05 : 0.5,
    highV: 5,
    edgeTimeS: 2 / sampleRateHz,
  });
  const normal = gaussian(mulberry32(seed));
  // A little electrical noise on the line, well below any sensible detection threshold.
  for (let i = 0; i < n; i++) samples[i] += 0.02 * normal();
  return { name, unit: 'V', samples };
}

interface Context {
  model: MachineModel;
  point: Point;
  pointShaft: string;
  graph: ShaftGraph;
  synth: Synth;
  meanRefHz: number;
  uniform: Uniform;
  normal: () => number;
  resonances: StructuralResonance[];
  slipFraction: number;
  meshHarmonicsG: readonly number[];
  tooth: { impactScale: number; depthScale: number; gateWidthPitches: number; gateEdgeFraction: number };
  loadZoneDepth: number;
}

function vibrationChannel(
  model: MachineModel,
  point: Point,
  options: SimulationOptions,
  motion: { revolutions: Float64Array; speedHz: Float64Array },
  graph: ShaftGraph,
  meanRefHz: number,
  seed: number,
): Channel {
  const quantity = point.quantity as 'acceleration' | 'velocity' | 'displacement';
  const unit = point.unit ?? DEFAULT_UNIT[quantity];
  const conversion = UNIT_FROM_SI[unit];
  if (!conversion || conversion.quantity !== quantity) {
    throw new SimulatorInputError('invalid_unit', `point '${point.id}' has unit '${unit}', which the simulator does not know for ${quantity}`);
  }
  const nearBearing = point.near ? model.bearings.find((b) => b.id === point.near) : undefined;
  const pointShaft = point.shaft ?? nearBearing?.shaft ?? model.speed.shaft;
  for (const r of options.resonances ?? []) {
    if (!(r.frequencyHz > 0 && r.dampingRatio > 0 && r.dampingRatio < 1 && (r.weight === undefined || r.weight >= 0))) {
      throw new SimulatorInputError(
        'invalid_resonance',
        `resonances: each needs frequencyHz > 0, 0 < dampingRatio < 1 and weight >= 0 (got ${JSON.stringify(r)})`,
      );
    }
  }
  const listed: ReadonlyArray<{ frequencyHz: number; dampingRatio: number; weight?: number }> =
    options.resonances ?? point.resonances ?? [DEFAULT_RESONANCE];
  // Modes above the band would be removed by the recorder's anti-alias filter; keep those inside it.
  let modes = listed.filter((r) => r.frequencyHz < 0.45 * options.sampleRateHz);
  if (modes.length === 0) modes = [{ frequencyHz: 0.3 * options.sampleRateHz, dampingRatio: DEFAULT_RESONANCE.dampingRatio }];
  const resonances = modes.map((r) => ({ frequencyHz: r.frequencyHz, dampingRatio: r.dampingRatio, weight: r.weight ?? 1 / modes.length }));
  checkShapeOptions(options);

  const uniform = mulberry32(seed);
  const synth: Synth = {
    sampleRateHz: options.sampleRateHz,
    sampleCount: motion.revolutions.length,
    refRevolutions: motion.revolutions,
    refSpeedHz: motion.speedHz,
    integrations: quantity === 'acceleration' ? 0 : quantity === 'velocity' ? 1 : 2,
    out: new Float64Array(motion.revolutions.length),
  };
  const ctx: Context = {
    model,
    point,
    pointShaft,
    graph,
    synth,
    meanRefHz,
    uniform,
    normal: gaussian(uniform),
    resonances,
    slipFraction: (options.bearingSlipPercent ?? 1.5) / 100,
    meshHarmonicsG: options.meshHarmonicsG ?? HEALTHY_MESH_G,
    tooth: {
      impactScale: options.toothFault?.impactScale ?? 1,
      depthScale: options.toothFault?.depthScale ?? 1,
      gateWidthPitches: options.toothFault?.gateWidthPitches ?? 1,
      gateEdgeFraction: options.toothFault?.gateEdgeFraction ?? 0.25,
    },
    loadZoneDepth: options.bearingFault?.loadZoneDepth ?? 1,
  };
  const faults = options.faults ?? [];
  for (const f of faults) checkFault(model, f);
  addHealthyMachine(ctx, options.healthyLevel ?? 1, faults);
  for (const f of faults) if (f.severity > 0) addFault(ctx, f);

  const out = synth.out;
  for (let i = 0; i < out.length; i++) out[i] *= conversion.factor;
  const noiseRms =
    options.noise?.rms ??
    (quantity === 'acceleration'
      ? ((options.noise?.accelerationRmsG ?? 0.02) * STANDARD_GRAVITY_MS2) * conversion.factor
      : 0.01);
  if (options.noise?.accelerationRmsG !== undefined && options.noise.rms === undefined && quantity !== 'acceleration') {
    throw new SimulatorInputError('invalid_noise', `noise.accelerationRmsG applies to acceleration points; point '${point.id}' measures ${quantity}, give noise.rms in ${unit}`);
  }
  if (!(noiseRms >= 0)) throw new SimulatorInputError('invalid_noise', `noise level (${noiseRms}) must be a number >= 0`);
  const noise = gaussian(mulberry32(options.noise?.seed ?? seed + 7919));
  if (options.noise?.colour === undefined) {
    for (let i = 0; i < out.length; i++) out[i] += noiseRms * noise();
  } else {
    const coloured = colouredNoise(out.length, options.sampleRateHz, options.noise.colour, noise);
    for (let i = 0; i < out.length; i++) out[i] += noiseRms * coloured[i]!;
  }
  return { name: point.id, unit, samples: out };
}

function checkShapeOptions(options: SimulationOptions): void {
  const bad = (name: string, value: unknown, rule: string) => {
    throw new SimulatorInputError('invalid_shape', `${name} (${String(value)}) must be ${rule}`);
  };
  const mesh = options.meshHarmonicsG;
  if (mesh !== undefined && !(Array.isArray(mesh) && mesh.every((a) => Number.isFinite(a) && a >= 0))) bad('meshHarmonicsG', mesh, 'a list of numbers >= 0');
  const t = options.toothFault ?? {};
  if (t.impactScale !== undefined && !(t.impactScale >= 0)) bad('toothFault.impactScale', t.impactScale, 'a number >= 0');
  if (t.depthScale !== undefined && !(t.depthScale >= 0)) bad('toothFault.depthScale', t.depthScale, 'a number >= 0');
  if (t.gateWidthPitches !== undefined && !(t.gateWidthPitches > 0 && t.gateWidthPitches <= 5)) bad('toothFault.gateWidthPitches', t.gateWidthPitches, 'a number > 0 and <= 5');
  if (t.gateEdgeFraction !== undefined && !(t.gateEdgeFraction >= 0 && t.gateEdgeFraction <= 0.5)) bad('toothFault.gateEdgeFraction', t.gateEdgeFraction, 'between 0 and 0.5');
  const depth = options.bearingFault?.loadZoneDepth;
  if (depth !== undefined && !(depth >= 0 && depth <= 1)) bad('bearingFault.loadZoneDepth', depth, 'between 0 and 1');
}

function checkFault(model: MachineModel, f: SimulatedFault): void {
  if (!(faultKinds as readonly string[]).includes(f.fault)) {
    throw new SimulatorInputError('unknown_fault', `fault '${f.fault}' is not one of ${faultKinds.join(', ')}`);
  }
  if (!(f.severity >= 0 && f.severity <= 1)) {
    throw new SimulatorInputError('invalid_severity', `severity of ${f.fault} on '${f.component}' (${f.severity}) must be between 0 and 1`);
  }
  const kind = componentKind(f.fault);
  const found =
    kind === 'shaft'
      ? model.shafts.some((s) => s.id === f.component) || (f.fault === 'unbalance' && model.rotors.some((r) => r.id === f.component))
      : kind === 'gear'
        ? gearsOf(model).some((g) => g.gear.gear === f.component)
        : kind === 'mesh'
          ? model.gearMeshes.some((m) => m.id === f.component)
          : kind === 'bearing'
            ? model.bearings.some((b) => b.id === f.component)
            : model.motor !== undefined && (model.motor.id ?? 'motor') === f.component;
  if (!found) {
    throw new SimulatorInputError('unknown_component', `fault ${f.fault} needs a ${kind} of machine '${model.id}'; '${f.component}' is not one`);
  }
}

function componentKind(fault: FaultKind): 'shaft' | 'gear' | 'mesh' | 'bearing' | 'motor' {
  if (fault === 'unbalance' || fault === 'misalignment' || fault === 'looseness') return 'shaft';
  if (fault === 'gear-wear') return 'mesh';
  if (fault.startsWith('gear-')) return 'gear';
  if (fault.startsWith('bearing-')) return 'bearing';
  return 'motor';
}

function gearsOf(model: MachineModel): Array<{ gear: Gear; mesh: GearMesh }> {
  return model.gearMeshes.flatMap((mesh) => [
    { gear: mesh.driver, mesh },
    { gear: mesh.driven, mesh },
  ]);
}

/** Peak acceleration (m/s²) of a line of r.m.s. velocity `velocityRmsMmPerS` at `frequencyHz`. */
function accelerationOfVelocity(velocityRmsMmPerS: number, frequencyHz: number): number {
  return velocityRmsMmPerS * 1e-3 * Math.SQRT2 * 2 * Math.PI * frequencyHz;
}

/** How strongly a line source on `shaft` reaches the sensor: halved for each belt or mesh between them. */
function lineGain(ctx: Context, shaft: string): number {
  return 0.5 ** ctx.graph.hops(shaft, ctx.pointShaft);
}

function randomPhase(ctx: Context): number {
  return 2 * Math.PI * ctx.uniform();
}

/** A family of orders of one shaft given as r.m.s. velocity at the recording's mean speed (the trade's severity language). */
function addShaftOrders(ctx: Context, shaft: string, orders: ReadonlyArray<[order: number, velocityRmsMmPerS: number]>): void {
  const ratio = ctx.graph.ratio(shaft);
  const gain = lineGain(ctx, shaft);
  for (const [order, v] of orders) {
    addOrderTone(ctx.synth, ratio, order, gain * accelerationOfVelocity(v, order * ratio * ctx.meanRefHz), randomPhase(ctx));
  }
}

const G = STANDARD_GRAVITY_MS2;
/** Healthy mesh tone, peak g at harmonics 1, 2, 3 of the mesh frequency. */
const HEALTHY_MESH_G = [0.15, 0.06, 0.025];

function addHealthyMachine(ctx: Context, level: number, faults: readonly SimulatedFault[]): void {
  const { model } = ctx;
  for (const shaft of model.shafts) {
    // Common practice: every rotor keeps some residual unbalance (1×) and some 2× from fits and stiffness asymmetry.
    addShaftOrders(ctx, shaft.id, [
      [1, 0.3 * level],
      [2, 0.1 * level],
    ]);
  }
  for (const rotor of model.rotors) {
    // Common practice: blade pass at blades × shaft speed from the pressure field of each passing blade.
    addShaftOrders(ctx, rotor.shaft, [[rotor.blades, 0.3 * level]]);
  }
  if (model.motor) {
    // Common practice: magnetic pull in an induction motor pulses at twice line frequency.
    addFixedTone(ctx.synth, 2 * model.motor.lineFrequencyHz, level * accelerationOfVelocity(0.1, 2 * model.motor.lineFrequencyHz), randomPhase(ctx));
  }
  for (const mesh of model.gearMeshes) addMesh(ctx, mesh, level, faults);
}

/**
 * The tooth-mesh force of one gear pair: a periodic function of the driver's angle with `teeth` periods
 * per revolution (harmonics of the mesh frequency), multiplied by a once-per-revolution envelope for
 * each faulty gear (eccentricity: amplitude modulation; a missing or broken tooth: a drop of the
 * force while that tooth should be in mesh), plus an impact through the structure each time the
 * faulty tooth comes round.
 */
function addMesh(ctx: Context, mesh: GearMesh, level: number, faults: readonly SimulatedFault[]): void {
  const { graph, synth } = ctx;
  const driverRatio = graph.ratio(mesh.driver.shaft);
  const gain = Math.max(lineGain(ctx, mesh.driver.shaft), lineGain(ctx, mesh.driven.shaft));
  const wear = faults.find((f) => f.fault === 'gear-wear' && f.component === mesh.id)?.severity ?? 0;
  // Common practice: uniform wear changes the tooth profile, raising 2× and 3× mesh most (Randall 2011, ch. 2; from memory).
  const wearG = [0.03, 0.2, 0.12];
  const meshG = Array.from({ length: Math.max(ctx.meshHarmonicsG.length, wearG.length) }, (_, k) => (ctx.meshHarmonicsG[k] ?? 0) * level + (wearG[k] ?? 0) * wear);
  const envelope = new Float64Array(synth.sampleCount).fill(1);
  let modulated = false;
  for (const side of [mesh.driver, mesh.driven]) {
    for (const f of faults) {
      if (f.component !== side.gear || f.severity <= 0) continue;
      const gearRatio = graph.ratio(side.shaft);
      if (f.fault === 'gear-eccentricity') {
        // Common practice: an eccentric gear loads its teeth more on one side, amplitude-modulating the mesh at its shaft speed.
        const m = 0.5 * f.severity;
        const phase = randomPhase(ctx);
        for (let i = 0; i < envelope.length; i++) envelope[i] *= 1 + m * Math.cos(2 * Math.PI * gearRatio * synth.refRevolutions[i]! + phase);
        modulated = true;
      } else if (f.fault === 'gear-missing-tooth' || f.fault === 'gear-broken-tooth') {
        addToothFault(ctx, side, gearRatio, f, envelope, gain);
        modulated = true;
      }
    }
  }
  if (!modulated && meshG.every((a) => a === 0)) return;
  for (let h = 1; h <= meshG.length; h++) {
    addOrderTone(synth, driverRatio, h * mesh.driver.teeth, gain * meshG[h - 1]! * G, randomPhase(ctx), modulated ? envelope : undefined);
  }
}

/**
 * A missing (or broken) tooth: while that tooth should carry the load the mesh force drops (all of it
 * for a missing tooth, half for a broken one), a gate one tooth pitch wide with raised-cosine edges;
 * when the next tooth takes the load it strikes, ringing the structure once per revolution of the gear.
 */
// McFadden & Smith (1985), "A signal processing technique for detecting local defects in a gear from the signal average of the vibration", Proc. IMechE 199(C4) (from memory): a local tooth fault modulates the mesh once per revolution and excites transients.
function addToothFault(ctx: Context, gear: Gear, gearRatio: number, f: SimulatedFault, envelope: Float64Array, gain: number): void {
  const { synth } = ctx;
  const missing = f.fault === 'gear-missing-tooth';
  const depth = Math.min(1, (missing ? 1 : 0.5) * f.severity * ctx.tooth.depthScale);
  // A gate never spans more than half a revolution, whatever the width asked for on a gear of few teeth.
  const pitch = Math.min(0.5, ctx.tooth.gateWidthPitches / gear.teeth);
  const edge = ctx.tooth.gateEdgeFraction * pitch;
  const start = ctx.uniform(); // where the faulty tooth sits, as a fraction of a revolution
  for (let i = 0; i < envelope.length; i++) {
    const r = gearRatio * synth.refRevolutions[i]! - start;
    const x = r - Math.floor(r); // position in the gear's revolution past the faulty tooth's start
    let w = 0;
    if (x < pitch) {
      if (x < edge) w = 0.5 - 0.5 * Math.cos((Math.PI * x) / edge);
      else if (x > pitch - edge) w = 0.5 - 0.5 * Math.cos((Math.PI * (pitch - x)) / edge);
      else w = 1;
    }
    envelope[i] *= 1 - depth * w;
  }
  const impactG = (missing ? 2 : 1.2) * f.severity * gain * ctx.tooth.impactScale;
  const firstRev = Math.ceil(gearRatio * synth.refRevolutions[0]! - start - pitch);
  const lastRev = gearRatio * synth.refRevolutions[synth.sampleCount - 1]!;
  const targets: number[] = [];
  for (let k = firstRev; k + start + pitch <= lastRev; k++) targets.push((k + start + pitch) / gearRatio);
  for (const t of timesAtRevolutions(synth, targets)) addRing(synth, t, impactG * G, ctx.resonances);
}

function addFault(ctx: Context, f: SimulatedFault): void {
  const { model } = ctx;
  const s = f.severity;
  switch (f.fault) {
    case 'unbalance': {
      const shaft = model.rotors.find((r) => r.id === f.component)?.shaft ?? f.component;
      const axial = ctx.point.direction === 'axial' ? 0.3 : 1;
      // Common practice: a mass unbalance is a force rotating with the shaft, one cycle per revolution.
      addShaftOrders(ctx, shaft, [[1, 8 * s * axial]]);
      return;
    }
    case 'misalignment': {
      const axial = ctx.point.direction === 'axial' ? 1.5 : 1;
      // Common practice: misalignment bends the coupling twice per turn; 2× dominant, 1× and 3× beside it, strong axially.
      addShaftOrders(ctx, f.component, [
        [1, 3 * s * axial],
        [2, 6 * s * axial],
        [3, 2 * s * axial],
      ]);
      return;
    }
    case 'looseness': {
      // Common practice: a loose part truncates the response, giving many harmonics of 1× and, when it rattles every other turn, half orders.
      const family: Array<[number, number]> = [];
      for (let k = 1; k <= 10; k++) {
        family.push([k, (4 * s) / k ** 0.7]);
        family.push([k - 0.5, (1.4 * s) / k ** 0.7]);
      }
      addShaftOrders(ctx, f.component, family);
      return;
    }
    case 'electrical': {
      const lineHz = model.motor!.lineFrequencyHz;
      // Common practice: an uneven air gap or stator fault raises the magnetic pull at twice line frequency.
      addFixedTone(ctx.synth, 2 * lineHz, accelerationOfVelocity(3 * s, 2 * lineHz), randomPhase(ctx));
      return;
    }
    case 'bearing-outer-race':
    case 'bearing-inner-race':
    case 'bearing-rolling-element':
    case 'bearing-cage':
      addBearingFault(ctx, model.bearings.find((b) => b.id === f.component)!, f);
      return;
    default:
      // Gear faults live inside the mesh force (addMesh).
      return;
  }
}

/** How strongly impacts in `bearing` reach the sensor: full at its own housing, less along the shaft and across each stage. */
function bearingGain(ctx: Context, bearing: Bearing): number {
  if (ctx.point.near === bearing.id) return 1;
  return 0.5 * 0.3 ** ctx.graph.hops(bearing.shaft, ctx.pointShaft);
}

/**
 * A localised bearing defect: an impact each time a rolling element meets it, at the kinematic defect
 * order of the bearing's shaft, with random slip between impacts, each impact ringing the structural
 * resonances of the point. Inner-race and rolling-element defects move through the load zone
 * (once per shaft turn and once per cage turn), so their impacts are amplitude-modulated.
 */
// Randall & Antoni (2011), "Rolling element bearing diagnostics—A tutorial", MSSP 25:485-520: impacts with 1-2 % random slip ringing a resonance; load-zone modulation.
function addBearingFault(ctx: Context, bearing: Bearing, f: SimulatedFault): void {
  const orders = bearingOrders(bearing);
  const ratio = ctx.graph.ratio(bearing.shaft);
  const { synth } = ctx;
  const defect =
    f.fault === 'bearing-outer-race'
      ? { order: orders.bpfo, impactG: 3, modulationOrder: 0 }
      : f.fault === 'bearing-inner-race'
        ? { order: orders.bpfi, impactG: 3, modulationOrder: 1 }
        : f.fault === 'bearing-rolling-element'
          ? // Common practice: a defect on a rolling element strikes both races, twice per spin revolution (2×BSF).
            { order: 2 * orders.bsf, impactG: 2, modulationOrder: orders.ftf }
          : { order: orders.ftf, impactG: 1, modulationOrder: 0 };
  const amplitude = defect.impactG * f.severity * bearingGain(ctx, bearing) * G;
  const shaftRevsEnd = ratio * synth.refRevolutions[synth.sampleCount - 1]!;
  const shaftRevsStart = ratio * synth.refRevolutions[0]!;
  const loadPhase = ctx.uniform();
  const targets: number[] = [];
  const amplitudes: number[] = [];
  let position = shaftRevsStart + ctx.uniform() / defect.order;
  while (position <= shaftRevsEnd) {
    targets.push(position / ratio);
    // Harris & Kotzalas (2007): load distribution q(ψ) = q_max·[1 − (1 − cos ψ)/(2ε)]^n; ε = 0.5 and n = 3/2 (ball bearing) give (cos ψ)^1.5 over ±90°.
    let load = 1;
    if (defect.modulationOrder > 0) {
      const psi = 2 * Math.PI * (defect.modulationOrder * position + loadPhase);
      const c = Math.cos(psi);
      const q = c > 0 ? c ** 1.5 : 0;
      // A partial load zone (loadZoneDepth < 1): a preloaded or lightly loaded bearing keeps some contact all round.
      load = ctx.loadZoneDepth === 1 ? q : 1 - ctx.loadZoneDepth + ctx.loadZoneDepth * q;
    }
    amplitudes.push(amplitude * load);
    const jitter = Math.max(-3, Math.min(3, ctx.normal()));
    position += (1 + ctx.slipFraction * jitter) / defect.order;
  }
  const times = timesAtRevolutions(synth, targets);
  for (let k = 0; k < times.length; k++) addRing(synth, times[k]!, amplitudes[k]!, ctx.resonances);
}
