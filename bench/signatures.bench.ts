// Signature throughput: closed-form Fourier series, fft.js series, partial sums, the torsional eigenproblem and
// whole predictions on the example machine. Prints figures; asserts nothing.
import { readFileSync } from 'node:fs';
import { loadMachineModel } from '@kinespec/kinematics';
import {
  faultCandidates, fourierSeries, partialSumWaveform, predictSignature, sampledFourierSeries, torsionalModes, toothDropExcitation,
} from '../packages/signatures/src/index.js';

function time(label: string, runs: number, f: () => unknown): void {
  f();
  const t0 = performance.now();
  for (let i = 0; i < runs; i++) f();
  const ms = (performance.now() - t0) / runs;
  process.stdout.write(`${label.padEnd(58)} ${ms.toFixed(3).padStart(10)} ms/run\n`);
}

const drop = toothDropExcitation({ teeth: 67, rippleFraction: 0.1, harmonics: 201 });
time('fourierSeries: tooth drop + ripple, Z = 67, 201 harmonics', 50, () => fourierSeries(drop.segments!, 201));
const many = Array.from({ length: 256 }, (_, i) => ({ kind: 'linear' as const, startFraction: i / 256, endFraction: (i + 1) / 256, startValue: Math.sin(i), endValue: Math.sin(i + 1) }));
time('fourierSeries: 256 linear segments, 1000 harmonics', 5, () => fourierSeries(many, 1000));
const x = new Float64Array(65536).map((_, i) => Math.cos((2 * Math.PI * 3 * i) / 65536) ** 3);
time('sampledFourierSeries: 65536 samples (fft.js), 1000 harmonics', 20, () => sampledFourierSeries(x, 1000));
const square = fourierSeries([{ kind: 'constant', startFraction: 0, endFraction: 0.5, value: 1 }, { kind: 'constant', startFraction: 0.5, endFraction: 1, value: -1 }], 999);
time('partialSumWaveform: 999 harmonics at 4000 points', 5, () => partialSumWaveform(square, { harmonics: 999, points: 4000 }));
for (const n of [10, 50, 200]) {
  const chain = { inertiasKgM2: Array.from({ length: n }, (_, i) => 0.1 + (i % 7) * 0.05), springs: Array.from({ length: n - 1 }, (_, i) => ({ from: i, to: i + 1, stiffnessNmPerRad: 1e4 * (1 + (i % 5)) })) };
  time(`torsionalModes: free chain of ${n} inertias`, n > 100 ? 3 : 20, () => torsionalModes(chain, { dampingRatio: 0.02 }));
}
const model = loadMachineModel(readFileSync(new URL('../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));
const candidates = faultCandidates(model);
time(`predictSignature: all ${candidates.length} candidates of aeration-mixer-2`, 5, () => candidates.map((c) => predictSignature(model, { fault: c.fault, component: c.component })));
time('predictSignature: missing tooth on wheel-1 (201 lines)', 20, () => predictSignature(model, { fault: 'gear-missing-tooth', component: 'wheel-1' }));
