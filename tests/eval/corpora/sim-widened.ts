// The own simulator widened: every physical parameter drawn per recording over a realistic range, so that no
// recording has the settings the analysis was tuned on (issue 13, §1b). Seeded: the same cases on every run.
import { shaftRatio, type MachineModel } from '@kinespec/kinematics';
import { mulberry32, simulateRecording, type FaultKind, type SimulationOptions, type Uniform } from '@kinespec/simulator';
import type { Corpus, LabelledCase, LabelledFault } from '../corpus.js';
import { CLEAR_SEVERITY_RANGE, SHALLOW_SEVERITY_RANGE } from '../goals.js';
import { demoMachines } from './demo-machines.js';
import { OWN_SIMULATOR_SOURCE } from './sim-tuned.js';

/** Faults built at a point of a demo machine: the point an engineer would measure for them (acceleration points only). */
interface Plan {
  machine: string;
  pointId: string;
  faults: Array<{ fault: FaultKind; component: string }>;
}

const bearingFaults = (component: string, kinds: Array<'outer' | 'inner' | 'ball'> = ['outer', 'inner', 'ball']) =>
  kinds.map((k) => ({
    fault: (k === 'outer' ? 'bearing-outer-race' : k === 'inner' ? 'bearing-inner-race' : 'bearing-rolling-element') as FaultKind,
    component,
  }));

const PLANS: Plan[] = [
  {
    machine: 'aeration-mixer-2',
    pointId: 'gb-input-h',
    faults: [
      { fault: 'unbalance', component: 'input' },
      { fault: 'misalignment', component: 'input' },
      { fault: 'looseness', component: 'input' },
      { fault: 'gear-missing-tooth', component: 'pinion-1' },
      { fault: 'gear-broken-tooth', component: 'pinion-1' },
      { fault: 'gear-missing-tooth', component: 'wheel-1' },
      { fault: 'gear-broken-tooth', component: 'pinion-2' },
      ...bearingFaults('input-de'),
    ],
  },
  {
    machine: 'skelmere-conveyor-drive-2',
    pointId: 'gb-input-h',
    faults: [
      { fault: 'misalignment', component: 'input' },
      { fault: 'looseness', component: 'input' },
      { fault: 'gear-missing-tooth', component: 'hs-pinion' },
      { fault: 'gear-broken-tooth', component: 'hs-pinion' },
      { fault: 'gear-broken-tooth', component: 'hs-wheel' },
      ...bearingFaults('input-de'),
    ],
  },
  {
    machine: 'skelmere-conveyor-drive-2',
    pointId: 'gb-intermediate-a',
    faults: [
      { fault: 'misalignment', component: 'intermediate' },
      { fault: 'gear-missing-tooth', component: 'ls-pinion' },
      { fault: 'gear-missing-tooth', component: 'hs-wheel' },
      ...bearingFaults('intermediate-nde'),
    ],
  },
  {
    machine: 'skelmere-feed-pump-3',
    pointId: 'pump-de-h',
    faults: [
      { fault: 'unbalance', component: 'impeller' },
      { fault: 'misalignment', component: 'train' },
      { fault: 'looseness', component: 'train' },
      ...bearingFaults('pump-de'),
    ],
  },
  { machine: 'skelmere-feed-pump-3', pointId: 'motor-de-h', faults: bearingFaults('motor-de', ['outer', 'inner']) },
  {
    machine: 'skelmere-id-fan-1',
    pointId: 'fan-de-h',
    faults: [
      { fault: 'unbalance', component: 'fan-wheel' },
      { fault: 'misalignment', component: 'fan' },
      { fault: 'looseness', component: 'fan' },
      ...bearingFaults('fan-de'),
    ],
  },
  // fan-nde is fan-de's twin on the same shaft: naming either counts, flagged (judge.ts).
  { machine: 'skelmere-id-fan-1', pointId: 'fan-de-v', faults: [...bearingFaults('fan-nde', ['outer']), ...bearingFaults('fan-de', ['inner'])] },
  {
    machine: 'skelmere-aeration-blower-1',
    pointId: 'blower-drive-h',
    faults: [
      { fault: 'unbalance', component: 'drive-lobes' },
      { fault: 'looseness', component: 'drive-rotor' },
      { fault: 'gear-missing-tooth', component: 'drive-timing-gear' },
      ...bearingFaults('drive-rotor-de'),
    ],
  },
  {
    machine: 'skelmere-aeration-blower-1',
    pointId: 'blower-idle-v',
    faults: [{ fault: 'gear-broken-tooth', component: 'idle-timing-gear' }, ...bearingFaults('idle-rotor-de', ['outer'])],
  },
];

/** Ranges every recording is drawn from, each with its reason. */
export const WIDENED_RANGES = {
  /** Issue 13: structural resonances anywhere from 0.1 to 0.45 of the sample rate (0.45: below the anti-alias filter's edge). */
  resonanceFraction: [0.1, 0.45],
  /** Issue 13: damping 2-10 % of critical, the span of bolted machine structures (common practice). */
  dampingRatio: [0.02, 0.1],
  /** One to three modes share each impact. */
  modes: [1, 3],
  /** Issue 13: sample rates 10-100 kHz (log-uniform: loggers cluster at the low end, test rigs at the high end). */
  sampleRateHz: [10_000, 100_000],
  /** Issue 13: records from 0.1 s to 10 s (log-uniform); never under the analysis's 1024 samples. */
  durationS: [0.1, 10],
  /** Healthy mesh tone at 1× GMF, peak g (log-uniform): a quiet helical stage to a loud spur stage (from memory). */
  meshG: [0.03, 0.5],
  /** 2× and 3× GMF against 1×: the mix of mesh harmonics varies with tooth profile and load (from memory). */
  mesh2Over1: [0.1, 1],
  mesh3Over1: [0.05, 0.7],
  /** Tooth impact against the simulator's default (2 g missing, 1.2 g broken at severity 1), log-uniform: "impact strength against the mesh level". */
  toothImpactScale: [0.2, 4],
  /** How deep and how long the mesh force drops (tooth pitches) and how soft its edges are. */
  toothDepthScale: [0.7, 1],
  toothGateWidthPitches: [0.6, 1.6],
  toothGateEdgeFraction: [0, 0.5],
  /** Issue 13: slip 0.5-3 % (Randall & Antoni 2011 give 1-2 % as typical). */
  bearingSlipPercent: [0.5, 3],
  /** How much of each inner-race / rolling-element impact the load zone removes outside it. */
  loadZoneDepth: [0.2, 1],
  /** Noise r.m.s., g (log-uniform): a quiet accelerometer to a noisy plant floor (from memory). */
  noiseG: [0.003, 0.05],
  /** Scale of the healthy machine's own lines (residual unbalance, blade pass, 2 × line), log-uniform. */
  healthyLevel: [0.5, 2],
} as const;

/** At least this many revolutions of the faulty part's shaft: lines and sidebands one shaft rate apart stand 5 bins apart (a Hann main lobe is 4 bins wide, common practice). */
export const MIN_REVOLUTIONS_TO_DECIDE = 5;

/** Healthy recordings per plan and two-fault recordings per plan; every planned fault is built once clear and once shallow. */
const HEALTHY_PER_PLAN = 2;
const TWO_FAULTS_PER_PLAN = 2;
const BASE_SEED = 130_000;
/** `--quick` and the CI subset keep every QUICK_EVERY-th case. */
export const QUICK_EVERY = 12;

export interface WidenedSpec {
  index: number;
  machine: string;
  pointId: string;
  faults: LabelledFault[];
  speedRpm: number;
  sampleRateHz: number;
  sampleCount: number;
  /** The drawn resonances go into the analysis's model too (a user with a bump test) or the point's are removed (one without). */
  resonanceGiven: boolean;
  options: Omit<SimulationOptions, 'pointId' | 'sampleRateHz' | 'sampleCount' | 'speedRpm' | 'faults'>;
}

const uniformIn = (u: Uniform, [a, b]: readonly [number, number]) => a + (b - a) * u();
const logUniformIn = (u: Uniform, [a, b]: readonly [number, number]) => a * (b / a) ** u();
const familyOf = (fault: string) => (fault.startsWith('gear-') ? 'gear' : fault.startsWith('bearing-') ? 'bearing' : 'shaft');

/** The widened cases: what each recording holds and every physical parameter drawn for it. */
export function widenedSpecs(options: { quick?: boolean } = {}): WidenedSpec[] {
  const machines = demoMachines();
  const plansOfCase: Array<{ plan: Plan; faults: Array<{ fault: FaultKind; component: string; clear: boolean }> }> = [];
  const pickUniform = mulberry32(BASE_SEED - 1);
  for (const plan of PLANS) {
    for (let k = 0; k < HEALTHY_PER_PLAN; k++) plansOfCase.push({ plan, faults: [] });
    for (const f of plan.faults) for (const clear of [true, false]) plansOfCase.push({ plan, faults: [{ ...f, clear }] });
    for (let k = 0; k < TWO_FAULTS_PER_PLAN; k++) {
      const first = plan.faults[Math.floor(pickUniform() * plan.faults.length)]!;
      const others = plan.faults.filter((f) => familyOf(f.fault) !== familyOf(first.fault));
      if (others.length === 0) continue;
      const second = others[Math.floor(pickUniform() * others.length)]!;
      plansOfCase.push({ plan, faults: [{ ...first, clear: pickUniform() < 0.5 }, { ...second, clear: pickUniform() < 0.5 }] });
    }
  }
  // Each case draws from its own seed (its index), so the quick subset holds the same recordings as the full run.
  const specs = plansOfCase.map(({ plan, faults }, index) => {
    const u = mulberry32(BASE_SEED + index);
    const model = machines[plan.machine]!;
    const R = WIDENED_RANGES;
    const speedRpm = uniformIn(u, [model.speed.minRpm ?? 0.9 * model.speed.nominalRpm, model.speed.maxRpm ?? 1.05 * model.speed.nominalRpm]);
    const sampleRateHz = Math.round(logUniformIn(u, R.sampleRateHz));
    const sampleCount = Math.max(1024, Math.round(logUniformIn(u, R.durationS) * sampleRateHz));
    const modeCount = R.modes[0] + Math.floor(u() * (R.modes[1] - R.modes[0] + 1));
    const resonances = Array.from({ length: modeCount }, () => ({
      frequencyHz: Math.round(uniformIn(u, R.resonanceFraction) * sampleRateHz),
      dampingRatio: uniformIn(u, R.dampingRatio),
      weight: 0.2 + u(),
    }));
    const totalWeight = resonances.reduce((s, r) => s + r.weight, 0);
    for (const r of resonances) r.weight /= totalWeight;
    const meshG = logUniformIn(u, R.meshG);
    const labelled: LabelledFault[] = faults.map((f) => ({
      fault: f.fault,
      component: f.component,
      severity: Math.round(100 * uniformIn(u, f.clear ? CLEAR_SEVERITY_RANGE : SHALLOW_SEVERITY_RANGE)) / 100,
    }));
    return {
      index,
      machine: plan.machine,
      pointId: plan.pointId,
      faults: labelled,
      speedRpm: Math.round(10 * speedRpm) / 10,
      sampleRateHz,
      sampleCount,
      resonanceGiven: u() < 0.5,
      options: {
        resonances,
        meshHarmonicsG: [meshG, meshG * uniformIn(u, R.mesh2Over1), meshG * uniformIn(u, R.mesh3Over1)],
        toothFault: {
          impactScale: logUniformIn(u, R.toothImpactScale),
          depthScale: uniformIn(u, R.toothDepthScale),
          gateWidthPitches: uniformIn(u, R.toothGateWidthPitches),
          gateEdgeFraction: uniformIn(u, R.toothGateEdgeFraction),
        },
        bearingSlipPercent: uniformIn(u, R.bearingSlipPercent),
        bearingFault: { loadZoneDepth: uniformIn(u, R.loadZoneDepth) },
        // Shares of noise power: white always present (the sensor's own floor), pink and brown in any mix.
        noise: { accelerationRmsG: logUniformIn(u, R.noiseG), colour: { white: 0.2 + u(), pink: u(), brown: 0.5 * u() } },
        healthyLevel: logUniformIn(u, R.healthyLevel),
        seed: BASE_SEED + 50_000 + index,
      },
    };
  });
  return options.quick ? specs.filter((s) => s.index % QUICK_EVERY === 0) : specs;
}

/** The shaft a fault turns with (what its lines are orders of). */
function shaftOfFault(model: MachineModel, f: LabelledFault): string {
  const bearing = model.bearings.find((b) => b.id === f.component);
  if (bearing) return bearing.shaft;
  for (const m of model.gearMeshes) {
    if (m.driver.gear === f.component) return m.driver.shaft;
    if (m.driven.gear === f.component) return m.driven.shaft;
  }
  return model.rotors.find((r) => r.id === f.component)?.shaft ?? f.component;
}

/** Why the record cannot decide a fault: fewer than MIN_REVOLUTIONS_TO_DECIDE turns of its shaft (null when it can). */
export function undecidableReason(model: MachineModel, spec: Pick<WidenedSpec, 'faults' | 'speedRpm' | 'sampleRateHz' | 'sampleCount'>): string | null {
  if (spec.faults.length === 0) return null;
  const durationS = spec.sampleCount / spec.sampleRateHz;
  const turns = spec.faults.map((f) => (spec.speedRpm / 60) * shaftRatio(model, shaftOfFault(model, f)) * durationS);
  if (turns.some((t) => t >= MIN_REVOLUTIONS_TO_DECIDE)) return null;
  return `${durationS.toFixed(2)} s holds ${Math.max(...turns).toFixed(1)} turns of the faulty shaft (< ${MIN_REVOLUTIONS_TO_DECIDE})`;
}

export function widenedCase(spec: WidenedSpec): LabelledCase {
  const simModel = demoMachines()[spec.machine]!;
  // The analysis gets the user's model: the point's resonances as drawn (measured by a bump test) or none known.
  const machine = structuredClone(simModel) as MachineModel;
  const point = machine.points.find((p) => p.id === spec.pointId)!;
  if (spec.resonanceGiven) point.resonances = spec.options.resonances!.map((r) => ({ frequencyHz: r.frequencyHz, dampingRatio: r.dampingRatio }));
  else delete point.resonances;
  const recording = simulateRecording(simModel, {
    ...spec.options,
    pointId: spec.pointId,
    sampleRateHz: spec.sampleRateHz,
    sampleCount: spec.sampleCount,
    speedRpm: spec.speedRpm,
    faults: spec.faults.map((f) => ({ fault: f.fault as FaultKind, component: f.component, severity: f.severity! })),
  });
  const what = spec.faults.length === 0 ? 'healthy' : spec.faults.map((f) => `${f.fault}@${f.component}/s${f.severity}`).join('+');
  const undecidable = undecidableReason(simModel, spec);
  return {
    id: `sim-widened/${spec.index}/${spec.machine}/${spec.pointId}/${what}`,
    machine,
    pointId: spec.pointId,
    recording,
    label: { faults: spec.faults, speedRpm: spec.speedRpm, speedGiven: false },
    tags: {
      machine: spec.machine,
      sampleRateHz: String(spec.sampleRateHz),
      durationS: (spec.sampleCount / spec.sampleRateHz).toFixed(3),
      resonanceGiven: spec.resonanceGiven ? 'yes' : 'no',
      resonancesHz: spec.options.resonances!.map((r) => `${r.frequencyHz}@${(100 * r.dampingRatio).toFixed(1)}%`).join(' '),
      noiseG: spec.options.noise!.accelerationRmsG!.toFixed(4),
    },
    ...(undecidable ? { undecidable } : {}),
  };
}

export function widenedCorpus(): Corpus {
  return {
    id: 'sim-widened',
    title: 'own simulator, widened (every physical parameter drawn per recording; speed not given)',
    source: `${OWN_SIMULATOR_SOURCE}; ranges in corpora/sim-widened.ts (WIDENED_RANGES)`,
    async load(options) {
      const specs = widenedSpecs({ quick: options.quick });
      return {
        available: true,
        cases: (function* () {
          for (const s of specs) yield widenedCase(s);
        })(),
      };
    },
  };
}
