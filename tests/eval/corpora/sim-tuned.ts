// The earlier evaluation: the own simulator at the fixed settings the analysis was tuned on (eval-cases.ts), and
// its variable-speed recordings with a tach, diagnosed without and with order tracking.
import { simulateRecording, type FaultKind } from '@kinespec/simulator';
import type { Corpus, LabelledCase } from '../corpus.js';
import { evaluationCases, rampCases, type EvalCase, type RampCase } from '../eval-cases.js';
import { demoMachines } from './demo-machines.js';

/** Simulates each case only when the runner asks for it, so that one recording at a time is held in memory. */
export function* lazily<T>(items: readonly T[], make: (item: T) => LabelledCase): Generator<LabelledCase> {
  for (const item of items) yield make(item);
}

export const OWN_SIMULATOR_SOURCE = '@kinespec/simulator (time-domain physics, independent of @kinespec/signatures), seeds fixed';

/** The fault a tuned or ramp case builds in, as the simulator and the label take it. */
function faultsOf(c: EvalCase | RampCase): Array<{ fault: FaultKind; component: string; severity: number }> {
  return c.fault === 'healthy' ? [] : [{ fault: c.fault, component: c.component!, severity: c.severity }];
}

/** One tuned-settings case as a labelled recording (speed not given, as before). */
export function tunedCase(c: EvalCase): LabelledCase {
  const machine = demoMachines()[c.machine]!;
  const faults = faultsOf(c);
  return {
    id: `sim-tuned/${c.id}`,
    machine,
    pointId: c.pointId,
    recording: simulateRecording(machine, {
      pointId: c.pointId,
      sampleRateHz: c.sampleRateHz,
      durationS: c.durationS,
      speedRpm: c.speedRpm,
      faults,
      noise: { accelerationRmsG: c.noiseG },
      seed: c.seed,
    }),
    label: { faults, speedRpm: c.speedRpm, speedGiven: false },
    tags: { machine: c.machine },
  };
}

export function tunedCorpus(): Corpus {
  return {
    id: 'sim-tuned',
    title: 'own simulator, tuned settings (demo machines at the settings the analysis was tuned on)',
    source: OWN_SIMULATOR_SOURCE,
    async load(options) {
      const cases = evaluationCases(demoMachines(), { subset: options.quick });
      return { available: true, cases: lazily(cases, tunedCase) };
    },
  };
}

/** One ramp with its tach channel; `domain` 'frequency' forces the frequency domain, 'auto' order-tracks from the tach. */
export function rampCase(c: RampCase, domain: 'frequency' | 'auto'): LabelledCase {
  const machine = demoMachines()[c.machine]!;
  const faults = faultsOf(c);
  return {
    id: `sim-ramp-${domain === 'auto' ? 'order' : 'frequency'}/${c.id}`,
    machine,
    pointId: c.pointId,
    recording: simulateRecording(machine, {
      pointId: c.pointId,
      sampleRateHz: c.sampleRateHz,
      durationS: c.durationS,
      speedProfile: c.rampRpm,
      includeTach: true,
      faults,
      seed: c.seed,
    }),
    label: { faults, speedRpm: (c.rampRpm[0] + c.rampRpm[1]) / 2, speedGiven: false },
    analysis: { domain },
    tags: { machine: c.machine, ramp: c.rampRpm.join('-') },
  };
}

export function rampCorpus(domain: 'frequency' | 'auto'): Corpus {
  return {
    id: domain === 'auto' ? 'sim-ramp-order' : 'sim-ramp-frequency',
    title:
      domain === 'auto'
        ? 'own simulator, speed ramps of ~5 % with a once-per-rev tach, order-tracked'
        : 'own simulator, the same speed ramps analysed in the frequency domain (a ramp recorded without a tach)',
    source: OWN_SIMULATOR_SOURCE,
    async load(options) {
      const cases = rampCases();
      return { available: true, cases: lazily(options.quick ? cases.slice(0, 4) : cases, (c) => rampCase(c, domain)) };
    },
  };
}
