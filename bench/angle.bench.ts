// Angle-domain throughput: pulse detection, speed, order resampling (sinc / cubic), order spectrum and
// gear TSA on simulated gearbox recordings, plus the simulator itself. Prints figures; asserts nothing.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadMachineModel } from '../packages/kinematics/src/index.js';
import {
  detectPulses,
  gearIndicators,
  orderSpectrum,
  resampleToAngle,
  shaftAngleFromPulses,
  shaftSynchronousAverage,
  speedFromPulses,
} from '../packages/signal/src/index.js';
import { simulateRecording } from '../packages/simulator/src/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const model = loadMachineModel(readFileSync(join(root, 'fixtures/machines/aeration-mixer-2.json'), 'utf8'));

function time<T>(label: string, samples: number, f: () => T): T {
  f(); // warm-up (JIT, FFT plans)
  const runs = 3;
  const t0 = performance.now();
  let out!: T;
  for (let r = 0; r < runs; r++) out = f();
  const ms = (performance.now() - t0) / runs;
  console.log(`${label.padEnd(44)} ${ms.toFixed(1).padStart(8)} ms   ${((samples / ms) * 1e-3).toFixed(2).padStart(7)} Msamples/s`);
  return out;
}

for (const [fs, durationS] of [[10_000, 10], [25_600, 10]] as const) {
  const n = fs * durationS;
  console.log(`\n${durationS} s at ${fs} Hz (${n} samples), speed ramp 1350 -> 1480 rpm, 1 pulse/rev tach`);
  const rec = time('simulateRecording (healthy + missing tooth)', n, () =>
    simulateRecording(model, {
      pointId: 'gb-input-h', sampleRateHz: fs, durationS, speedProfile: [1350, 1480], includeTach: true, seed: 1,
      faults: [{ fault: 'gear-missing-tooth', component: 'wheel-2', severity: 0.6 }],
    }),
  );
  const x = rec.channels[0]!.samples;
  const edges = time('detectPulses', n, () => detectPulses(rec.channels[1]!.samples, fs));
  const pulses = time('speedFromPulses', n, () => speedFromPulses(edges.edgeTimesS));
  const angle = time('shaftAngleFromPulses (spline at every sample)', n, () => shaftAngleFromPulses(pulses, n, fs));
  const sig = time('resampleToAngle sinc, maxOrder 160', n, () => resampleToAngle(x, fs, angle, { maxOrder: 160 }));
  time('resampleToAngle cubic, maxOrder 160', n, () => resampleToAngle(x, fs, angle, { maxOrder: 160, interpolation: 'cubic' }));
  time(`orderSpectrum (${sig.revolutions} rev x ${sig.samplesPerRev})`, sig.samples.length, () => orderSpectrum(sig));
  time('shaftSynchronousAverage + gearIndicators, wheel-2', n, () => {
    const tsa = shaftSynchronousAverage(x, fs, angle, (18 / 67) * (23 / 79) * 0.7128, { maxOrder: 276 });
    return gearIndicators(tsa.average, { teeth: 79, maxOrder: tsa.angleSignal.maxOrder });
  });
}
