// Diagnosis benchmark: analyseRecording on 65,536-sample recordings (2.56 s at 25.6 kHz) of demo machines, with and
// without a model, warm (predictions cached, JIT warm), cold (a model the process has not seen: every candidate's
// signature predicted again), on a velocity (mm/s) channel and order-tracked from a tach; per-stage medians and
// minima from AnalyseOptions.stageTimesMs.
// Prints figures; asserts nothing. Runs the built packages (npm run build first).
import { readFileSync } from 'node:fs';
import { analyseRecording, type AnalyseOptions } from '@kinespec/diagnosis';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';
import { simulateRecording } from '@kinespec/simulator';

const SAMPLES = 65536;
const FS = 25600;
const machineText = (id: string) => readFileSync(new URL(`../fixtures/machines/${id}.json`, import.meta.url), 'utf8');
const mixerText = machineText('aeration-mixer-2');
const mixer = loadMachineModel(mixerText);
const conveyor = loadMachineModel(machineText('skelmere-conveyor-drive-2'));
const pump = loadMachineModel(machineText('skelmere-feed-pump-3'));

const outerRace = simulateRecording(mixer, { pointId: 'gb-input-h', sampleRateHz: FS, sampleCount: SAMPLES, speedRpm: 1466, faults: [{ fault: 'bearing-outer-race', component: 'input-de', severity: 0.8 }], seed: 3 });
const toothFault = simulateRecording(conveyor, { pointId: 'gb-input-h', sampleRateHz: FS, sampleCount: SAMPLES, speedRpm: 1478, faults: [{ fault: 'gear-missing-tooth', component: 'hs-pinion', severity: 0.8 }], seed: 5 });
const velocityChannel = simulateRecording(pump, { pointId: 'pump-de-v', sampleRateHz: FS, sampleCount: SAMPLES, speedRpm: 2960, faults: [{ fault: 'unbalance', component: 'impeller', severity: 0.6 }], seed: 9 });
const ramp = simulateRecording(mixer, { pointId: 'gb-input-h', sampleRateHz: FS, sampleCount: SAMPLES, speedProfile: [1420, 1490], includeTach: true, seed: 4 });

interface Run {
  wallMs: number;
  cpuMs: number;
  stages: Record<string, number>;
}

function once(recording: Recording, options: AnalyseOptions): Run {
  const stages: Record<string, number> = {};
  const cpu = process.cpuUsage();
  const t = performance.now();
  analyseRecording(recording, { ...options, stageTimesMs: stages });
  const wallMs = performance.now() - t;
  const used = process.cpuUsage(cpu);
  return { wallMs, cpuMs: (used.user + used.system) / 1000, stages };
}

const median = (xs: readonly number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length === 0 ? 0 : s[Math.floor(s.length / 2)]!;
};

interface Summary {
  label: string;
  runs: Run[];
}

function repeat(label: string, repeats: number, make: (i: number) => [Recording, AnalyseOptions]): Summary {
  const runs: Run[] = [];
  for (let i = 0; i < repeats; i++) runs.push(once(...make(i)));
  return { label, runs };
}

/** A copy of the model under another name: nothing of it is cached, as for a machine the worker has not analysed yet. */
let copies = 0;
function unseen(text: string): MachineModel {
  const m = loadMachineModel(text);
  return { ...m, name: `${m.name} (bench copy ${++copies})` };
}

const started = performance.now();
const first = once(outerRace, { model: mixer, pointId: 'gb-input-h' });
// JIT warm-up on every path before anything is timed.
for (let i = 0; i < 5; i++) {
  analyseRecording(outerRace, { model: mixer, pointId: 'gb-input-h' });
  analyseRecording(toothFault, { model: conveyor, pointId: 'gb-input-h' });
  analyseRecording(outerRace);
  analyseRecording(velocityChannel, { model: pump, pointId: 'pump-de-v' });
  analyseRecording(ramp, { model: mixer, pointId: 'gb-input-h' });
}
const summaries: Summary[] = [
  repeat('model, warm (bearing fault)', 25, () => [outerRace, { model: mixer, pointId: 'gb-input-h' }]),
  repeat('model, warm (tooth fault)', 25, () => [toothFault, { model: conveyor, pointId: 'gb-input-h' }]),
  repeat('model, cold (unseen model)', 8, () => [outerRace, { model: unseen(mixerText), pointId: 'gb-input-h' }]),
  repeat('no model (kurtogram band)', 25, () => [outerRace, {}]),
  repeat('model, mm/s channel (pump)', 25, () => [velocityChannel, { model: pump, pointId: 'pump-de-v' }]),
  repeat('model, tach: order-tracked', 11, () => [ramp, { model: mixer, pointId: 'gb-input-h' }]),
];

const w = 46;
const col = 13;
const stageNames: string[] = [];
for (const s of summaries) for (const r of s.runs) for (const k of Object.keys(r.stages)) if (!stageNames.includes(k)) stageNames.push(k);
const minimum = (xs: readonly number[]) => (xs.length === 0 ? 0 : Math.min(...xs));
/** One table: each stage's statistic over the runs of each column (a loaded machine inflates medians, hardly minima). */
function table(title: string, statistic: (xs: readonly number[]) => number): void {
  console.log(`${title.padEnd(w)}${summaries.map((s) => s.label.slice(0, col - 1).padStart(col)).join('')}`);
  for (const name of stageNames) {
    console.log(`${('  ' + name).padEnd(w)}${summaries.map((s) => {
      const xs = s.runs.map((r) => r.stages[name]).filter((x): x is number => x !== undefined);
      return (xs.length ? statistic(xs).toFixed(2) : '-').padStart(col);
    }).join('')}`);
  }
  console.log(`${'total (wall)'.padEnd(w)}${summaries.map((s) => statistic(s.runs.map((r) => r.wallMs)).toFixed(1).padStart(col)).join('')}`);
  console.log(`${'total (CPU of the process, incl. GC)'.padEnd(w)}${summaries.map((s) => statistic(s.runs.map((r) => r.cpuMs)).toFixed(1).padStart(col)).join('')}`);
}
console.log(`analyseRecording on ${SAMPLES} samples at ${FS} Hz, ms`);
console.log(`first analysis in a fresh process (JIT and predictions cold): ${first.wallMs.toFixed(1)} ms`);
table('median per stage', median);
table('minimum per stage', minimum);
console.log('columns:', summaries.map((s) => s.label).join(' | '));
const warm = median(summaries[0]!.runs.map((r) => r.cpuMs));
console.log(`one core at the warm model figure: ${(1000 / warm).toFixed(0)} analyses/s (CPU ${warm.toFixed(1)} ms each); the upload goal of 100/s on 2 cores needs < 20 ms, in practice well under 10 ms`);
console.log(`(bench ran ${((performance.now() - started) / 1000).toFixed(1)} s)`);
