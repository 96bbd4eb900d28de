// Diagnosis benchmark: analyseRecording on a 65,536-sample recording (2.56 s at 25.6 kHz) of the example machine,
// median of repeated runs, with and without a model, and order-tracked from a tach. Prints figures; asserts nothing.
import { readFileSync } from 'node:fs';
import { analyseRecording } from '@kinespec/diagnosis';
import { loadMachineModel } from '@kinespec/kinematics';
import { envelopeSpectrum, noiseFloor, welchSpectrum } from '@kinespec/signal';
import { simulateRecording } from '@kinespec/simulator';

const model = loadMachineModel(readFileSync(new URL('../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));
const steady = simulateRecording(model, { pointId: 'gb-input-h', sampleRateHz: 25600, sampleCount: 65536, speedRpm: 1466, faults: [{ fault: 'bearing-outer-race', component: 'input-de', severity: 0.8 }], seed: 3 });
const ramp = simulateRecording(model, { pointId: 'gb-input-h', sampleRateHz: 25600, sampleCount: 65536, speedProfile: [1420, 1490], includeTach: true, seed: 4 });
const x = steady.channels[0]!.samples;

function median(run: () => void, repeats: number): number {
  const times: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t = performance.now();
    run();
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

const t0 = performance.now();
analyseRecording(steady, { model, pointId: 'gb-input-h' });
const first = performance.now() - t0;
const rows: Array<[string, number]> = [
  ['first analysis (predictions for 36 candidates computed and cached)', first],
  ['analyseRecording, model, frequency domain', median(() => analyseRecording(steady, { model, pointId: 'gb-input-h' }), 15)],
  ['analyseRecording, no model', median(() => analyseRecording(steady), 15)],
  ['analyseRecording, model, tach: angle domain', median(() => analyseRecording(ramp, { model, pointId: 'gb-input-h' }), 7)],
  ['  of which: Welch spectrum, 32768-sample segments', median(() => welchSpectrum(x, 25600, { segmentLength: 32768, scaling: 'peak' }), 15)],
  ['  of which: running-median noise floor, 16385 bins', median(() => noiseFloor(welchSpectrum(x, 25600, { segmentLength: 32768, scaling: 'peak' })), 15)],
  ['  of which: squared-envelope spectrum', median(() => envelopeSpectrum(x, 25600, { bandHz: [2890, 3910], squared: true, segmentLength: 32768, scaling: 'peak' }), 15)],
];
for (const [label, ms] of rows) console.log(`${label.padEnd(70)} ${ms.toFixed(1).padStart(8)} ms`);
console.log('(65,536 samples; the last three include their own Welch spectrum where named)');
