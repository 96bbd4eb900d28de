import type { MachineModel } from '@kinespec/kinematics';
import type { FaultKind } from '@kinespec/simulator';

/** One labelled recording of the evaluation: a simulated point of a demo machine, healthy or with one fault. */
export interface EvalCase {
  id: string;
  machine: string;
  pointId: string;
  /** 'healthy' or the fault built into the recording. */
  fault: FaultKind | 'healthy';
  component: string | null;
  severity: number;
  speedRpm: number;
  sampleRateHz: number;
  durationS: number;
  /** White noise on the channel: g for acceleration points. */
  noiseG: number;
  seed: number;
}

/** Faults the evaluation builds, per demo machine point (component ids from fixtures/machines). */
interface PointPlan {
  machine: string;
  pointId: string;
  faults: Array<{ fault: FaultKind; component: string }>;
}

const PLANS: PointPlan[] = [
  {
    machine: 'aeration-mixer-2',
    pointId: 'gb-input-h',
    faults: [
      { fault: 'unbalance', component: 'input' },
      { fault: 'misalignment', component: 'input' },
      { fault: 'gear-missing-tooth', component: 'pinion-1' },
      { fault: 'gear-broken-tooth', component: 'pinion-1' },
      { fault: 'gear-missing-tooth', component: 'wheel-1' },
      { fault: 'bearing-outer-race', component: 'input-de' },
      { fault: 'bearing-inner-race', component: 'input-de' },
      { fault: 'bearing-rolling-element', component: 'input-de' },
    ],
  },
  {
    machine: 'skelmere-conveyor-drive-2',
    pointId: 'gb-input-h',
    faults: [
      { fault: 'misalignment', component: 'input' },
      { fault: 'gear-broken-tooth', component: 'hs-pinion' },
      { fault: 'gear-missing-tooth', component: 'hs-pinion' },
      { fault: 'bearing-outer-race', component: 'input-de' },
      { fault: 'bearing-inner-race', component: 'input-de' },
    ],
  },
  {
    machine: 'skelmere-conveyor-drive-2',
    pointId: 'gb-intermediate-a',
    faults: [
      { fault: 'gear-missing-tooth', component: 'ls-pinion' },
      { fault: 'bearing-outer-race', component: 'intermediate-nde' },
      { fault: 'bearing-rolling-element', component: 'intermediate-nde' },
    ],
  },
  {
    machine: 'skelmere-feed-pump-3',
    pointId: 'pump-de-h',
    faults: [
      { fault: 'unbalance', component: 'impeller' },
      { fault: 'misalignment', component: 'train' },
      { fault: 'bearing-outer-race', component: 'pump-de' },
      { fault: 'bearing-inner-race', component: 'pump-de' },
      { fault: 'bearing-rolling-element', component: 'pump-de' },
    ],
  },
  {
    machine: 'skelmere-id-fan-1',
    pointId: 'fan-de-h',
    faults: [
      { fault: 'unbalance', component: 'fan-wheel' },
      { fault: 'misalignment', component: 'fan' },
      { fault: 'bearing-outer-race', component: 'fan-de' },
      { fault: 'bearing-inner-race', component: 'fan-de' },
    ],
  },
  {
    machine: 'skelmere-aeration-blower-1',
    pointId: 'blower-drive-h',
    faults: [
      { fault: 'unbalance', component: 'drive-rotor' },
      { fault: 'bearing-outer-race', component: 'drive-rotor-de' },
      { fault: 'bearing-inner-race', component: 'drive-rotor-de' },
    ],
  },
];

/** Severities built for every fault: moderate to severe (1 = the simulator's severe fault). */
export const SEVERITIES = [0.4, 0.7, 1.0] as const;
/** A fault at or above this severity counts as severe for the goals. */
export const SEVERE = 0.7;

/**
 * The labelled set: every planned fault at each severity, and healthy recordings, each at a speed off
 * nominal (−2.5 % … +2 %, machines run off nameplate), one of two noise levels and two sample rates,
 * with fixed seeds so the set is the same on every run.
 */
export function evaluationCases(models: Readonly<Record<string, MachineModel>>, options: { subset?: boolean } = {}): EvalCase[] {
  const speedFactors = [0.975, 1.0, 1.02];
  const noises = [0.01, 0.03];
  const rates = [25600, 20000];
  const cases: EvalCase[] = [];
  let seed = 1000;
  for (const plan of PLANS) {
    const model = models[plan.machine];
    if (!model) throw new Error(`evaluation needs fixtures/machines/${plan.machine}.json`);
    const nominal = model.speed.nominalRpm;
    const add = (fault: EvalCase['fault'], component: string | null, severity: number, variant: number) => {
      const speedRpm = Math.min(model.speed.maxRpm ?? Infinity, nominal * speedFactors[variant % speedFactors.length]!);
      seed += 1;
      cases.push({
        id: `${plan.machine}/${plan.pointId}/${fault}${component ? `@${component}` : ''}/s${severity}/v${variant}`,
        machine: plan.machine,
        pointId: plan.pointId,
        fault,
        component,
        severity,
        speedRpm,
        sampleRateHz: rates[variant % rates.length]!,
        durationS: 4,
        noiseG: noises[Math.floor(variant / 2) % noises.length]!,
        seed,
      });
    };
    for (let v = 0; v < 4; v++) add('healthy', null, 0, v);
    plan.faults.forEach((f, i) => {
      SEVERITIES.forEach((s, j) => add(f.fault, f.component, s, i + j));
    });
  }
  if (!options.subset) return cases;
  // The CI subset: one healthy recording and one severe fault of each family on the first machine.
  const first = cases.filter((c) => c.machine === 'aeration-mixer-2');
  return [
    first.find((c) => c.fault === 'healthy')!,
    first.find((c) => c.fault === 'gear-missing-tooth' && c.component === 'pinion-1' && c.severity === 1)!,
    first.find((c) => c.fault === 'bearing-outer-race' && c.severity === 1)!,
    first.find((c) => c.fault === 'unbalance' && c.severity === 1)!,
  ];
}

/** A recording whose speed ramps during the record, with a once-per-rev tach channel (issue 7: order tracking). */
export interface RampCase {
  id: string;
  machine: string;
  pointId: string;
  fault: 'healthy' | 'gear-missing-tooth' | 'bearing-outer-race';
  component: string | null;
  severity: number;
  rampRpm: [number, number];
  sampleRateHz: number;
  durationS: number;
  seed: number;
}

/** Run-ups and run-downs of about 5 %: enough to smear the mesh sidebands of a frequency spectrum over many bins. */
export function rampCases(): RampCase[] {
  const out: RampCase[] = [];
  let seed = 5000;
  const add = (machine: string, pointId: string, fault: RampCase['fault'], component: string | null, severity: number, rampRpm: [number, number]) => {
    seed += 1;
    out.push({ id: `${machine}/${pointId}/${fault}${component ? `@${component}` : ''}/s${severity}/${rampRpm.join('-')}rpm`, machine, pointId, fault, component, severity, rampRpm, sampleRateHz: 25600, durationS: 4, seed });
  };
  for (const ramp of [[1400, 1490], [1490, 1410]] as Array<[number, number]>) {
    add('aeration-mixer-2', 'gb-input-h', 'healthy', null, 0, ramp);
    add('aeration-mixer-2', 'gb-input-h', 'gear-missing-tooth', 'pinion-1', 1, ramp);
    add('aeration-mixer-2', 'gb-input-h', 'gear-missing-tooth', 'pinion-1', 0.7, ramp);
    add('aeration-mixer-2', 'gb-input-h', 'bearing-outer-race', 'input-de', 1, ramp);
  }
  for (const ramp of [[1420, 1500], [1500, 1420]] as Array<[number, number]>) {
    add('skelmere-conveyor-drive-2', 'gb-input-h', 'healthy', null, 0, ramp);
    add('skelmere-conveyor-drive-2', 'gb-input-h', 'gear-missing-tooth', 'hs-pinion', 1, ramp);
  }
  return out;
}
